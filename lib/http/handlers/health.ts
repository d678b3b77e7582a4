import { can } from "@/lib/auth/permissions";
import { getRequestUser } from "@/lib/auth/session";
import { healthReport } from "@/lib/jobs/runs";
import { json, route } from "@/lib/http/route";

/**
 * Health check, open to everyone: the database (answers, latency), the analysis runner (the web
 * server's own runner, or the queue depth and the number of live workers) and the runs by state;
 * 503 when the database does not answer. Administrators also get the list of live workers.
 */
export const health = route(async (req) => {
  const user = await getRequestUser(req).catch(() => null);
  const report = await healthReport({ detail: !!user && can(user, "user:admin") });
  return json(report, report.ok ? 200 : 503);
});
