import type { Metadata } from "next";
import { requireUser } from "@/app/_lib/session";
import { AccountSettings } from "@/components/AccountSettings";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Your account" };

export default async function AccountPage() {
  const user = await requireUser("/account");
  return (
    <>
      <div className="page-head">
        <h1>Your account</h1>
        <span className="sub">
          {user.name} · {user.email} · {user.role}
        </span>
      </div>
      <AccountSettings />
    </>
  );
}
