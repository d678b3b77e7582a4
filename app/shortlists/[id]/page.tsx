import type { Metadata } from "next";
import Link from "next/link";
import { notFound } from "next/navigation";
import { CAUTION } from "@/lib/analysis/shortlist";
import { getShortlistPage, type Pins, type RunInfo } from "@/lib/db";
import { anchorOptions } from "@/lib/views/anchors";
import { SPEC_FIELDS } from "@/shared/schemas/requirements";
import { allowed, requireUser } from "@/app/_lib/session";
import { ResultView } from "@/components/shortlist/ResultView";
import { RunProgress } from "@/components/shortlist/RunProgress";
import { PrintButton, RunAction } from "@/components/shortlist/RunActions";
import { fixed, utc } from "@/shared/format";
import { ShortlistCollaboration } from "@/components/discussion/ShortlistCollaboration";

export const dynamic = "force-dynamic";
export const metadata: Metadata = { title: "Shortlist" };

const samePins = (a: Pins | null, b: Pins) =>
  !!a && a.requirement.setId === b.requirement.setId && a.requirement.revision === b.requirement.revision &&
  a.arms.length === b.arms.length && a.arms.every((x, i) => x.armId === b.arms[i].armId && x.revision === b.arms[i].revision);

function runLabel(r: RunInfo): string {
  const when = r.finishedAt ? utc(r.finishedAt) : utc(r.createdAt);
  const secs = r.startedAt && r.finishedAt && !r.reusedFromId ? ` in ${fixed((r.finishedAt.getTime() - r.startedAt.getTime()) / 1000, 1)} s` : "";
  return `${r.status}${r.reusedFromId ? " (reused an identical earlier analysis)" : ""}, ${when}${secs}`;
}

export default async function ShortlistPage({ params, searchParams }: { params: Promise<{ id: string }>; searchParams: Promise<{ run?: string | string[] }> }) {
  const { id } = await params;
  const sp = await searchParams;
  const user = await requireUser(`/shortlists/${id}`);
  const wanted = typeof sp.run === "string" ? sp.run : undefined;
  const data = await getShortlistPage(id, { run: wanted });
  if (!data) notFound();
  const { shortlist: sl, runs, shown, analysis, pinned } = data;
  const canWrite = allowed(user, "shortlist:write");
  const canSaveWeights = allowed(user, "req:write");
  const latest = runs[0] ?? null;
  const currentPins: Pins = { requirement: { setId: sl.requirement.setId, revision: sl.requirement.revision }, arms: sl.arms.map((a) => ({ armId: a.armId, revision: a.revision })) };
  const shownIsLatest = !!shown && shown.id === latest?.id;
  const shownFresh = shownIsLatest && samePins(shown.pins, currentPins) && sl.stale.length === 0;
  const armName = new Map(sl.arms.map((a) => [a.armId, a.name]));

  return (
    <>
      <div className="page-head">
        <h1>{sl.name}</h1>
        <span className="sub">
          created {utc(sl.createdAt)}
          {sl.createdBy && ` by ${sl.createdBy.name}`}
        </span>
        <div className="actions no-print">
          <PrintButton />
        </div>
      </div>

      <section className="panel pins" aria-label="Pinned revisions" data-testid="pins">
        <p>
          Requirement set <Link href={`/requirements/${sl.requirement.setId}`}>{sl.requirement.name}</Link> revision {sl.requirement.revision}; arms:{" "}
          {sl.arms.map((a, i) => (
            <span key={a.armId}>
              {i > 0 && ", "}
              <Link href={`/arms/${a.armId}`}>{a.name}</Link> rev {a.revision}
              {a.deleted && " (deleted since)"}
            </span>
          ))}
          .
        </p>
        {sl.stale.length > 0 && (
          <div className="notice warn" data-testid="stale-notice" role="status">
            <strong>Newer revisions exist.</strong> This shortlist is pinned to older revisions:
            <ul>
              {sl.stale.map((s) => (
                <li key={s}>{s}</li>
              ))}
            </ul>
            {canWrite ? (
              <p className="no-print">
                <RunAction shortlistId={id} kind="repin" label="Re-pin to latest and analyse" /> The current result stays readable in the run history.
              </p>
            ) : (
              <p>An editor can re-pin it to the latest revisions.</p>
            )}
          </div>
        )}
      </section>

      {latest && (latest.status === "queued" || latest.status === "running") && (
        <RunProgress
          shortlistId={id}
          runId={latest.id}
          canCancel={canWrite}
          initial={{ status: latest.status, progress: latest.progress, stage: latest.stage, error: latest.error, queuePosition: latest.queuePosition }}
        />
      )}
      {latest && latest.status === "cancelled" && (
        <div className="notice warn" data-testid="run-cancelled">
          <strong>The latest analysis was {latest.error ?? "cancelled"}</strong> ({utc(latest.finishedAt)}).
          {canWrite && (
            <p className="no-print">
              <RunAction shortlistId={id} kind="runs" label="Run the analysis again" />
            </p>
          )}
        </div>
      )}
      {latest && latest.status === "failed" && (
        <div className="notice bad" data-testid="run-failed" role="alert">
          <strong>The latest analysis failed</strong> ({utc(latest.finishedAt)}): {latest.error}
          {canWrite && (
            <p className="no-print">
              <RunAction shortlistId={id} kind="runs" label="Run the analysis again" />
            </p>
          )}
        </div>
      )}
      {!latest && (
        <div className="notice">
          No analysis yet. {canWrite && <RunAction shortlistId={id} kind="runs" label="Analyse now" />}
        </div>
      )}
      {wanted && !shown && <p className="notice bad">This shortlist has no analysis run {wanted}.</p>}
      {shown && shown.status !== "done" && wanted && <p className="notice warn">Run {shown.id} has no result ({runLabel(shown)}).</p>}

      {analysis && shown && (
        <>
          <div className={`result-label ${shownFresh ? "fresh" : "old"}`} data-testid="result-label">
            <strong>{shownFresh ? "Current result" : "Earlier result — not for the current pins"}</strong>: analysis {analysis.version}, run {runLabel(shown)}. Pinned: requirement set
            revision {shown.pins?.requirement.revision ?? "?"};{" "}
            {analysis.arms.map((a) => `${a.name} rev ${a.revision}`).join(", ")}.
            {!shownFresh && latest && latest.id !== shown.id && latest.status === "done" && (
              <>
                {" "}
                <Link href={`/shortlists/${id}`}>Show the latest result</Link>.
              </>
            )}
          </div>
          <p className="caution-top" data-testid="caution">
            {analysis.caution}
          </p>
          <ResultView analysis={analysis} shortlistId={id} runId={shown.id} requirementSetId={sl.requirement.setId} requirementRevision={shown.pins?.requirement.revision ?? null} canSaveWeights={canSaveWeights} />
        </>
      )}

      {runs.length > 0 && (
        <section className="panel no-print" aria-labelledby="runs-h" data-testid="run-history">
          <h2 id="runs-h">Analysis runs</h2>
          <ol className="runs">
            {runs.map((r) => (
              <li key={r.id}>
                {r.status === "done" ? <Link href={`/shortlists/${id}?run=${r.id}`}>{runLabel(r)}</Link> : runLabel(r)}
                {r.id === shown?.id && <strong> (shown)</strong>}
                <span className="sub">
                  {" "}
                  — requirement rev {r.pins?.requirement.revision ?? "?"}; {(r.pins?.arms ?? []).map((a) => `${armName.get(a.armId) ?? a.armId} rev ${a.revision}`).join(", ")}
                </span>
                {r.error && <div className="err">{r.error}</div>}
              </li>
            ))}
          </ol>
        </section>
      )}
      <ShortlistCollaboration
        shortlistId={id}
        user={user}
        anchors={anchorOptions({ ...pinned, compliance: pinned.specs.map((s, index) => ({ index, label: SPEC_FIELDS[s.field].label })) })}
      />
      <p className="caution">{CAUTION}</p>
    </>
  );
}
