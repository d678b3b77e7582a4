import "server-only";
import { DEFAULT_SIGN_UP_MODE, SIGN_UP_MODES, type SignUpMode } from "@/shared/schemas/roles";
import { db, type Tx } from "./client";
import { recordAudit } from "./audit";

const SIGN_UP_MODE = "signUpMode";

const asMode = (value: string | undefined): SignUpMode => {
  try {
    const v = value === undefined ? undefined : JSON.parse(value);
    return (SIGN_UP_MODES as readonly unknown[]).includes(v) ? (v as SignUpMode) : DEFAULT_SIGN_UP_MODE;
  } catch {
    return DEFAULT_SIGN_UP_MODE;
  }
};

/** The sign-up mode (approval when never set). */
export async function getSignUpMode(tx: Tx | ReturnType<typeof db> = db()): Promise<SignUpMode> {
  const row = await tx.setting.findUnique({ where: { key: SIGN_UP_MODE } });
  return asMode(row?.value);
}

/** Sets the sign-up mode (an audit event records who changed it from what). */
export async function setSignUpMode(actorId: string, mode: SignUpMode): Promise<SignUpMode> {
  return db().$transaction(async (tx) => {
    const before = await getSignUpMode(tx);
    if (before === mode) return mode;
    await tx.setting.upsert({
      where: { key: SIGN_UP_MODE },
      create: { key: SIGN_UP_MODE, value: JSON.stringify(mode), updatedById: actorId },
      update: { value: JSON.stringify(mode), updatedById: actorId },
    });
    await recordAudit(tx, { actorId, action: "settings.signUpMode", entityType: "setting", entityId: SIGN_UP_MODE, detail: { from: before, to: mode } });
    return mode;
  });
}
