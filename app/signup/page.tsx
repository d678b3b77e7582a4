import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { getSignUpMode, hasAccounts } from "@/lib/db";
import { AuthForm } from "@/components/AuthForm";

export const dynamic = "force-dynamic";
// The address may hold an invitation token: never send it on as a Referer.
export const metadata: Metadata = { title: "Sign up", referrer: "no-referrer" };

export default async function SignUpPage({ searchParams }: { searchParams: Promise<{ invitation?: string | string[] }> }) {
  if (await getCurrentUser()) redirect("/arms");
  const { invitation } = await searchParams;
  const [mode, first] = await Promise.all([getSignUpMode(), hasAccounts().then((any) => !any)]);
  return <AuthForm mode="signup" signUp={{ mode, first, invitation: typeof invitation === "string" ? invitation : undefined }} />;
}
