import type { GuestShortlistView } from "@/lib/views/share-view";
import { fixed } from "@/shared/format";

const Verdict = ({ v, reason }: { v: string; reason: string }) => (
  <span className={`verdict-${v}`} title={reason}>
    {v}
  </span>
);

/** The allow-listed result a share-link guest sees: pins, ranking, target/path verdicts, compliance. */
export function GuestResult({ view }: { view: GuestShortlistView }) {
  const { shortlist, analysis } = view;
  const name = new Map(shortlist.arms.map((a) => [a.id, a.name]));
  const showPrice = !view.visibility.hidePrices;
  return (
    <>
      <section className="panel" aria-labelledby="pins-h">
        <h2 id="pins-h">Pinned revisions</h2>
        <p>
          Requirement set {shortlist.requirement.name}, revision {shortlist.requirement.revision}.
        </p>
        <table data-testid="guest-arms">
          <thead>
            <tr>
              <th>Arm</th>
              <th>Revision</th>
              {showPrice && <th>Price</th>}
            </tr>
          </thead>
          <tbody>
            {shortlist.arms.map((a) => (
              <tr key={a.id}>
                <td>{a.name}</td>
                <td>{a.revision}</td>
                {showPrice && <td>{a.price ?? "not stated"}</td>}
              </tr>
            ))}
          </tbody>
        </table>
      </section>
      {!analysis && <p className="notice">No finished analysis yet.</p>}
      {analysis && (
        <>
          <section className="panel" aria-labelledby="rank-h">
            <h2 id="rank-h">Ranking</h2>
            <p className="sub">Analysis finished {analysis.finishedAt ? analysis.finishedAt.slice(0, 16).replace("T", " ") + " UTC" : "—"}.</p>
            <table data-testid="guest-ranking">
              <thead>
                <tr>
                  <th>Rank</th>
                  <th>Arm</th>
                  <th>Score</th>
                  <th>Must requirements failed</th>
                </tr>
              </thead>
              <tbody>
                {analysis.ranking.map((r) => (
                  <tr key={r.armId}>
                    <td>{r.disqualified ? "—" : r.rank}</td>
                    <td>{r.name}</td>
                    <td>{fixed(r.score, 3)}</td>
                    <td>
                      {[...r.failedMusts, ...(r.hiddenFailedMusts > 0 ? [`${r.hiddenFailedMusts} price requirement${r.hiddenFailedMusts > 1 ? "s" : ""}`] : [])].join("; ") || "none"}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </section>
          {(analysis.targets.length > 0 || analysis.paths.length > 0) && (
            <section className="panel" aria-labelledby="tasks-h">
              <h2 id="tasks-h">Targets and paths</h2>
              <table data-testid="guest-tasks">
                <thead>
                  <tr>
                    <th>Task</th>
                    {shortlist.arms.map((a) => (
                      <th key={a.id}>{a.name}</th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {[...analysis.targets.map((t) => ({ ...t, kind: "target" })), ...analysis.paths.map((p) => ({ ...p, kind: "path" }))].map((row) => (
                    <tr key={`${row.kind}:${row.name}`}>
                      <th scope="row">
                        {row.kind} {row.name}
                      </th>
                      {row.cells.map((c) => (
                        <td key={c.armId}>
                          <Verdict v={c.verdict} reason={c.reason} />
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </section>
          )}
          {analysis.compliance.length > 0 && (
            <section className="panel" aria-labelledby="comp-h">
              <h2 id="comp-h">Spec compliance</h2>
              <table data-testid="guest-compliance">
                <thead>
                  <tr>
                    <th>Requirement</th>
                    {analysis.compliance[0].cells.map((c) => (
                      <th key={c.armId}>{name.get(c.armId) ?? c.armId}</th>
                    ))}
                  </tr>
                </thead>
                <tbody>
                  {analysis.compliance.map((row) => (
                    <tr key={row.index}>
                      <th scope="row">
                        {row.label} ({row.priority})
                      </th>
                      {row.cells.map((c) => (
                        <td key={c.armId}>
                          {c.value} <Verdict v={c.verdict} reason={c.reason} />
                        </td>
                      ))}
                    </tr>
                  ))}
                </tbody>
              </table>
            </section>
          )}
        </>
      )}
    </>
  );
}
