import type { Metadata } from "next";
import { requireUser, allowed } from "@/app/_lib/session";
import { UserRoles } from "@/components/UserRoles";
import { SignUpSettings } from "@/components/SignUpSettings";
import { Invitations } from "@/components/Invitations";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Users" };

export default async function UsersPage() {
  const user = await requireUser("/admin/users");
  if (!allowed(user, "user:admin")) {
    return (
      <div className="panel narrow" role="alert">
        <h1>Users</h1>
        <p>Only administrators manage accounts. Ask an administrator to change your role.</p>
      </div>
    );
  }
  return (
    <>
      <div className="page-head">
        <h1>Users</h1>
      </div>
      <UserRoles currentUserId={user.id} />
      <SignUpSettings />
      <Invitations />
    </>
  );
}
