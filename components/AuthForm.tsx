"use client";
import Link from "next/link";
import { useState } from "react";
import { api, byPath } from "./api";
import { safeNextUrl } from "./nextPath";
import { ErrorSummary, TextField, errText } from "./fields";

interface Props {
  mode: "signin" | "signup";
  next?: string;
}


export function AuthForm({ mode, next }: Props) {
  const [email, setEmail] = useState("");
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setMessage(null);
    setErrors({});
    const res =
      mode === "signup"
        ? await api<{ user: unknown }>("/api/auth/signup", "POST", { email, name, password })
        : await api<{ user: unknown }>("/api/auth/signin", "POST", { email, password });
    if (!res.ok) {
      setBusy(false);
      setErrors(byPath(res.error.fieldErrors));
      setMessage(
        res.status === 401
          ? "The email or password is not right."
          : res.status === 429
            ? "Too many attempts. Wait a minute and try again."
            : res.error.message,
      );
      return;
    }
    window.location.assign(safeNextUrl(next, window.location.origin));
  }

  const fieldMessages = Object.entries(errors).flatMap(([p, ms]) => ms.map((m) => `${p}: ${m}`));
  return (
    <form onSubmit={submit} noValidate className="panel narrow" aria-labelledby="auth-title">
      <h1 id="auth-title">{mode === "signup" ? "Create an account" : "Sign in"}</h1>
      <p className="sub">Armsift keeps candidate arm models and cell requirement sets for a team shortlisting robot arms.</p>
      {mode === "signup" && (
        <p className="sub">The first account becomes the administrator; later accounts start as viewers until an administrator changes their role.</p>
      )}
      <ErrorSummary
        title={message ? (mode === "signin" ? "Not signed in" : "Account not created") : undefined}
        messages={message && fieldMessages.length === 0 ? [message] : fieldMessages}
      />
      <TextField label="Email" type="email" name="email" autoComplete="email" value={email} onChange={setEmail} error={errText(errors, "email")} required />
      {mode === "signup" && (
        <TextField label="Name" name="name" autoComplete="name" value={name} onChange={setName} error={errText(errors, "name")} required />
      )}
      <TextField
        label="Password"
        type="password"
        name="password"
        hint={mode === "signup" ? "at least 10 characters" : undefined}
        autoComplete={mode === "signup" ? "new-password" : "current-password"}
        value={password}
        onChange={setPassword}
        error={errText(errors, "password")}
        required
      />
      <div className="toolbar">
        <button type="submit" className="primary" disabled={busy}>
          {mode === "signup" ? "Create account" : "Sign in"}
        </button>
        {mode === "signup" ? (
          <span className="sub">
            Have an account? <Link href="/signin">Sign in</Link>
          </span>
        ) : (
          <span className="sub">
            New here? <Link href="/signup">Create an account</Link>
          </span>
        )}
      </div>
    </form>
  );
}
