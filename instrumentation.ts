// Runs once when a server process starts (Next.js instrumentation hook): analysis runs left behind
// by a stopped server are settled before the first request (lib/jobs/runs.ts, startUp).
export async function register(): Promise<void> {
  if (process.env.NEXT_RUNTIME !== "nodejs") return;
  const { startUp } = await import("@/lib/jobs/runs");
  await startUp().catch((err: unknown) => console.error(`analysis runs at start-up: ${err instanceof Error ? err.message : String(err)}`));
}
