import type { Metadata } from "next";
import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/session";
import { AuthForm } from "@/components/AuthForm";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Sign up" };

export default async function SignUpPage() {
  if (await getCurrentUser()) redirect("/arms");
  return <AuthForm mode="signup" />;
}
