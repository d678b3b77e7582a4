"use client";
import Link from "next/link";
import { useState } from "react";
import type { SignUpMode } from "@/shared/schemas/roles";
import { api, byPath } from "./api";
import { safeNextUrl } from "./nextPath";
import { PASSWORD_ADVICE } from "./passwordAdvice";
import { ErrorSummary, TextField, errText } from "./fields";

interface Props {
  mode: "signin" | "signup";
  next?: string;
  /** Sign-up only: how accounts come in, whether this is the very first one, the invitation token of the link. */
  signUp?: { mode: SignUpMode; first: boolean; invitation?: string };
}

/** What the sign-up page says about how accounts come in. */
function signUpIntro(s: NonNullable<Props["signUp"]>): string {
  if (s.first) return "No account exists yet: this first account becomes the administrator.";
  if (s.invitation) return "You are signing up with an invitation: the account gets the role it names and is ready at once.";
  if (s.mode === "invitation") return "New accounts need an invitation here. Ask an administrator for an invitation link.";
  if (s.mode === "approval") return "New accounts wait for an administrator's approval before they can sign in, and start as viewers.";
  return "New accounts start as viewers until an administrator changes their role.";
}

const PASSWORD_HINT = "at least 10 characters";


export function AuthForm({ mode, next, signUp }: Props) {
  const [email, setEmail] = useState("");
  const [name, setName] = useState("");
  const [password, setPassword] = useState("");
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [message, setMessage] = useState<string | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const closed = mode === "signup" && signUp?.mode === "invitation" && !signUp.first && !signUp.invitation;

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setMessage(null);
    setErrors({});
    const res =
      mode === "signup"
        ? await api<{ user?: unknown; signUp?: { access: "active" | "pending"; message: string } }>("/api/auth/signup", "POST", {
            email, name, password, ...(signUp?.invitation ? { invitation: signUp.invitation } : {}),
          })
        : await api<{ user?: unknown; signUp?: undefined }>("/api/auth/signin", "POST", { email, password });
    setBusy(false);
    if (!res.ok) {
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
    if (res.status === 202 && res.data.signUp) {
      setDone(res.data.signUp.message);
      setPassword("");
      return;
    }
    window.location.assign(safeNextUrl(next, window.location.origin));
  }

  if (done) {
    return (
      <section className="panel narrow" aria-labelledby="auth-title">
        <h1 id="auth-title">Sign-up received</h1>
        <p className="notice" role="status" data-testid="signup-done">
          {done}
        </p>
        <p>
          <Link href="/signin">Go to sign in</Link>
        </p>
      </section>
    );
  }

  const fieldMessages = Object.entries(errors).flatMap(([p, ms]) => ms.map((m) => `${p === "invitation" ? "Invitation" : p}: ${m}`));
  return (
    <form onSubmit={submit} noValidate className="panel narrow" aria-labelledby="auth-title">
      <h1 id="auth-title">{mode === "signup" ? "Create an account" : "Sign in"}</h1>
      <p className="sub">Armsift keeps candidate arm models and cell requirement sets for a team shortlisting robot arms.</p>
      {mode === "signup" && signUp && (
        <p className={closed ? "notice warn" : "sub"} data-testid="signup-mode">
          {signUpIntro(signUp)}
        </p>
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
        hint={mode === "signup" ? PASSWORD_HINT : undefined}
        autoComplete={mode === "signup" ? "new-password" : "current-password"}
        value={password}
        onChange={setPassword}
        error={errText(errors, "password")}
        required
      />
      {mode === "signup" && <p className="hint">{PASSWORD_ADVICE}</p>}
      {errText(errors, "invitation") && (
        <p className="err" role="alert">
          Invitation: {errText(errors, "invitation")}
        </p>
      )}
      <div className="toolbar">
        <button type="submit" className="primary" disabled={busy || closed}>
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
