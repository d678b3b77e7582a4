import "server-only";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { can, type Action } from "@/lib/auth/permissions";

type PageUser = NonNullable<Awaited<ReturnType<typeof getCurrentUser>>>;

/** The signed-in user, or a redirect to /signin (keeping where the visitor wanted to go). */
export async function requireUser(from?: string): Promise<PageUser> {
  const user = await getCurrentUser();
  if (!user) redirect(from ? `/signin?next=${encodeURIComponent(from)}` : "/signin");
  return user;
}

/** Whether the user may do `action`; pages use it to render read-only views. */
export function allowed(user: PageUser | null, action: Action): boolean {
  return can(user, action);
}
