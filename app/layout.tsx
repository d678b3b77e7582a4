import type { Metadata } from "next";
import { getCurrentUser } from "@/lib/auth/session";
import { TopBar } from "@/components/TopBar";
import "./globals.css";

export const dynamic = "force-dynamic";

export const metadata: Metadata = {
  title: { default: "Armsift", template: "%s · Armsift" },
  description: "Shortlist robot arms for an application: reach, dexterity, statics, ranking and spec compliance.",
};

export default async function RootLayout({ children }: { children: React.ReactNode }) {
  const user = await getCurrentUser();
  return (
    <html lang="en">
      <body>
        <a href="#main" className="skip">
          Skip to content
        </a>
        <TopBar user={user ? { name: user.name, email: user.email, role: user.role } : null} />
        <main id="main">{children}</main>
      </body>
    </html>
  );
}
