import type { HealthReport } from "@/lib/jobs/runs";
import { utc } from "@/shared/format";

const seconds = (from: Date | string, now: string) => `${Math.max(0, Math.round((Date.parse(now) - new Date(from).getTime()) / 1000))} s ago`;

/** The health report as tables: database, runner or queue with its workers, runs by state. */
export function SystemStatus({ report, now }: { report: HealthReport; now: string }) {
  const { database, runner, runs } = report;
  return (
    <div className="system-status" data-testid="system-status">
      <section className="panel" aria-labelledby="db-h">
        <h2 id="db-h">Database</h2>
        <table>
          <tbody>
            <tr>
              <th scope="row">Provider</th>
              <td>{database.provider === "postgres" ? "PostgreSQL (team set-up)" : "SQLite (embedded file)"}</td>
            </tr>
            <tr>
              <th scope="row">State</th>
              <td data-testid="db-state">{database.ok ? `answers (${database.latencyMs} ms round trip)` : `does not answer: ${database.error}`}</td>
            </tr>
          </tbody>
        </table>
      </section>
      <section className="panel" aria-labelledby="runner-h">
        <h2 id="runner-h">Analysis runner</h2>
        {"error" in runner ? (
          <p className="notice bad">{runner.error}</p>
        ) : runner.kind === "local" ? (
          <p data-testid="runner">
            Analyses run inside this web server, at most {runner.concurrency} at once: {runner.running} running, {runner.waiting} waiting.
          </p>
        ) : (
          <>
            <p data-testid="runner">
              Analyses run on the queue: {runner.depth.waiting} waiting, {runner.depth.active} being analysed, {runner.depth.failed} failed after their
              retries; {runner.liveWorkers} live worker{runner.liveWorkers === 1 ? "" : "s"}.
            </p>
            {runner.liveWorkers === 0 && <p className="notice warn">No worker is running: start `npm run worker` on a worker machine, or queued analyses wait.</p>}
            {runner.workers && runner.workers.length > 0 && (
              <div className="table-wrap">
                <table data-testid="workers">
                  <thead>
                    <tr>
                      <th scope="col">Worker</th>
                      <th scope="col">Machine</th>
                      <th scope="col">Process</th>
                      <th scope="col">At once</th>
                      <th scope="col">Started</th>
                      <th scope="col">Last heartbeat</th>
                      <th scope="col">Analysing</th>
                    </tr>
                  </thead>
                  <tbody>
                    {runner.workers.map((w) => (
                      <tr key={w.id}>
                        <td>{w.id}</td>
                        <td>{w.host}</td>
                        <td className="num">{w.pid}</td>
                        <td className="num">{w.concurrency}</td>
                        <td>{utc(w.startedAt, { seconds: true })}</td>
                        <td>{seconds(w.lastSeenAt, now)}</td>
                        <td>{w.runIds.length ? `${w.runIds.length} run${w.runIds.length === 1 ? "" : "s"}` : "idle"}</td>
                      </tr>
                    ))}
                  </tbody>
                </table>
              </div>
            )}
          </>
        )}
      </section>
      {runs && (
        <section className="panel" aria-labelledby="runs-h">
          <h2 id="runs-h">Analysis runs</h2>
          <table data-testid="run-counts">
            <tbody>
              {(Object.entries(runs) as [string, number][]).map(([state, n]) => (
                <tr key={state}>
                  <th scope="row">{state}</th>
                  <td className="num">{n}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
      )}
    </div>
  );
}
