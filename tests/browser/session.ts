// The set-up most page tests share: a server on a fresh seeded database, one browser and the first
// account (the administrator) signed up on an open page, for the enclosing describe block.
import { afterAll, beforeAll } from "vitest";
import { signUp, startHarness, type Browser, type Harness, type TrackedPage } from "./harness";

export interface AdminSession {
  h: Harness;
  b: Browser;
  t: TrackedPage;
}

/** Registers the block's beforeAll (start, open /signup, sign up `user`) and afterAll (close); the fields are set once it has run. */
export function withAdminSession(user: { email: string; name: string; password: string }): AdminSession {
  const s = {} as AdminSession;
  beforeAll(async () => {
    s.h = await startHarness();
    s.b = await s.h.browser();
    s.t = await s.b.open("/signup");
    await signUp(s.t, user);
  });
  afterAll(async () => {
    await s.h?.close();
  });
  return s;
}
