import "server-only";
import { can, type SessionUser } from "@/lib/auth/permissions";
import { ShareLinkManager } from "@/components/share/ShareLinkManager";
import { DiscussionPanel, type AnchorOption } from "./DiscussionPanel";

/** The shortlist page's discussion and (for editors and admins) its share links. */
export function ShortlistCollaboration({ shortlistId, user, anchors }: { shortlistId: string; user: SessionUser; anchors: AnchorOption[] }) {
  const on = { shortlistId };
  return (
    <>
      {can(user, "comment:read", on) && (
        <DiscussionPanel
          anchors={anchors}
          mode={{
            kind: "member", shortlistId, userId: user.id, canWrite: can(user, "comment:write", on), canResolve: can(user, "comment:resolve", on),
            canModerate: can(user, "comment:delete", { ...on, ownerId: null }),
          }}
        />
      )}
      {can(user, "share:manage", on) && <ShareLinkManager shortlistId={shortlistId} userId={user.id} canRevokeAll={can(user, "share:revoke", { ...on, ownerId: null })} />}
    </>
  );
}
