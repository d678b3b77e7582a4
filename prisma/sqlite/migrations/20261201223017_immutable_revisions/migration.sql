-- Revisions are immutable: a saved revision is never edited or removed.
-- (Written by hand: Prisma's schema language has no triggers.)

CREATE TRIGGER "ArmRevision_no_update"
BEFORE UPDATE ON "ArmRevision"
BEGIN
    SELECT RAISE(ABORT, 'arm revisions are immutable');
END;

CREATE TRIGGER "ArmRevision_no_delete"
BEFORE DELETE ON "ArmRevision"
BEGIN
    SELECT RAISE(ABORT, 'arm revisions are immutable');
END;

CREATE TRIGGER "RequirementRevision_no_update"
BEFORE UPDATE ON "RequirementRevision"
BEGIN
    SELECT RAISE(ABORT, 'requirement revisions are immutable');
END;

CREATE TRIGGER "RequirementRevision_no_delete"
BEFORE DELETE ON "RequirementRevision"
BEGIN
    SELECT RAISE(ABORT, 'requirement revisions are immutable');
END;

-- The audit log is append-only as well.
CREATE TRIGGER "AuditEvent_no_update"
BEFORE UPDATE ON "AuditEvent"
BEGIN
    SELECT RAISE(ABORT, 'audit events are append-only');
END;
