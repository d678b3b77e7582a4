import type { Metadata } from "next";
import { allowed, requireUser } from "@/app/_lib/session";
import { healthReport } from "@/lib/jobs/runs";
import { SystemStatus } from "@/components/admin/SystemStatus";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "System" };

/** The database, the analysis runner (or the queue and its live workers) and the runs by state. Admins only. */
export default async function SystemPage() {
  const user = await requireUser("/admin/system");
  if (!allowed(user, "user:admin")) {
    return (
      <div className="panel narrow" role="alert">
        <h1>System</h1>
        <p>Only administrators see the state of the database and the analysis workers.</p>
      </div>
    );
  }
  const report = await healthReport({ detail: true });
  return (
    <>
      <div className="page-head">
        <h1>System</h1>
        <span className="sub">the same facts as GET /api/health, read when this page was loaded</span>
      </div>
      <SystemStatus report={report} now={new Date().toISOString()} />
    </>
  );
}
