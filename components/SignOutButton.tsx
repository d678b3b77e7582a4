"use client";
import { useState } from "react";

export function SignOutButton() {
  const [busy, setBusy] = useState(false);
  async function signOut() {
    setBusy(true);
    await fetch("/api/auth/signout", { method: "POST" }).catch(() => undefined);
    // A full navigation drops every cached page of the signed-in user.
    window.location.assign("/signin");
  }
  return (
    <button type="button" className="small" onClick={signOut} disabled={busy}>
      Sign out
    </button>
  );
}
