"use client";
import { useRouter } from "next/navigation";
import { useId, useMemo, useState } from "react";
import { compareIpAtLeast, parseIpCode } from "@/lib/analysis/spec";
import { api, byPath } from "../api";
import { parseNum } from "../pose";
import { price } from "@/shared/format";
import type { ArmListing } from "@/lib/views/listing";

interface RequirementChoice {
  id: string;
  name: string;
  revision: number;
  targets: number;
  paths: number;
}

/** A number filter typed as text; with a unit shown beside it when given. */
function FilterNumber(props: { id: string; label: string; unit?: string; value: string; onChange: (v: string) => void }) {
  const input = <input id={props.id} type="text" inputMode="decimal" value={props.value} onChange={(e) => props.onChange(e.target.value)} />;
  return (
    <div className="field">
      <label htmlFor={props.id}>{props.label}</label>
      {props.unit ? (
        <div className="unit-input">
          {input}
          <span className="unit">{props.unit}</span>
        </div>
      ) : (
        input
      )}
    </div>
  );
}

/** Shortlist creation: a requirement set and arms from the catalog, filtered by datasheet values. */
export function CreateShortlist({ arms, sets }: { arms: ArmListing[]; sets: RequirementChoice[] }) {
  const router = useRouter();
  const uid = useId();
  const [name, setName] = useState("");
  const [setId, setSetId] = useState(sets[0]?.id ?? "");
  const [minReach, setMinReach] = useState("");
  const [minPayload, setMinPayload] = useState("");
  const [axes, setAxes] = useState("any");
  const [minIp, setMinIp] = useState("");
  const [maxPrice, setMaxPrice] = useState("");
  const [chosen, setChosen] = useState<Set<string>>(new Set());
  const [errors, setErrors] = useState<Record<string, string[]>>({});
  const [problem, setProblem] = useState("");
  const [busy, setBusy] = useState(false);

  const filterErrors: string[] = [];
  const num = (label: string, text: string) => {
    const v = parseNum(text);
    if (v === "bad") filterErrors.push(`${label}: not a number`);
    return typeof v === "number" ? v : undefined;
  };
  const reachMm = num("Reach at least", minReach);
  const payloadKg = num("Payload at least", minPayload);
  const priceMax = num("Price at most", maxPrice);
  const ip = minIp.trim() ? parseIpCode(minIp.trim().toUpperCase()) : null;
  if (minIp.trim() && !ip) filterErrors.push("IP code at least: write it like IP54");

  const shown = useMemo(
    () =>
      arms.filter((a) => {
        if (reachMm !== undefined && !(a.specs.reach !== undefined && a.specs.reach * 1000 >= reachMm)) return false;
        if (payloadKg !== undefined && !(a.specs.ratedPayload !== undefined && a.specs.ratedPayload >= payloadKg)) return false;
        if (axes !== "any" && a.axes !== Number(axes)) return false;
        if (ip) {
          const armIp = a.specs.ipCode ? parseIpCode(a.specs.ipCode) : null;
          if (!armIp || compareIpAtLeast(armIp, ip).verdict !== "meets") return false;
        }
        if (priceMax !== undefined && !(a.specs.price !== undefined && a.specs.price <= priceMax)) return false;
        return true;
      }),
    [arms, reachMm, payloadKg, axes, ip, priceMax],
  );
  const axisCounts = [...new Set(arms.map((a) => a.axes))].sort((x, y) => x - y);
  // Prices are compared as stated; with more than one currency in the catalog, the unit says so.
  const currencies = [...new Set(arms.map((a) => a.specs.currency).filter((c): c is string => !!c))];
  const priceUnit = currencies.length === 1 ? currencies[0] : "as stated per arm";

  function toggle(id: string, on: boolean) {
    const next = new Set(chosen);
    if (on) next.add(id);
    else next.delete(id);
    setChosen(next);
  }

  async function submit(e: React.FormEvent) {
    e.preventDefault();
    setBusy(true);
    setProblem("");
    setErrors({});
    const armIds = arms.filter((a) => chosen.has(a.id)).map((a) => a.id);
    const r = await api<{ id: string }>("/api/shortlists", "POST", { name, requirementSetId: setId, armIds });
    if (r.ok) {
      router.push(`/shortlists/${r.data.id}`);
      return;
    }
    setBusy(false);
    setErrors(byPath(r.error.fieldErrors));
    setProblem(r.error.message);
  }

  const err = (p: string) => errors[p]?.join("; ");
  return (
    <form onSubmit={submit} noValidate>
      <div className="page-head">
        <h1>New shortlist</h1>
      </div>
      <fieldset className="panel">
        <legend>Shortlist</legend>
        <div className="grid wide">
          <div className="field">
            <label htmlFor={uid + "-name"}>Name</label>
            <input id={uid + "-name"} type="text" value={name} onChange={(e) => setName(e.target.value)} aria-invalid={err("name") ? true : undefined} />
            {err("name") && <span className="err">{err("name")}</span>}
          </div>
          <div className="field">
            <label htmlFor={uid + "-set"}>Requirement set</label>
            <select id={uid + "-set"} value={setId} onChange={(e) => setSetId(e.target.value)} aria-invalid={err("requirementSetId") ? true : undefined}>
              {sets.map((s) => (
                <option key={s.id} value={s.id}>
                  {s.name} (rev {s.revision}; {s.targets} targets, {s.paths} paths)
                </option>
              ))}
            </select>
            {err("requirementSetId") && <span className="err">{err("requirementSetId")}</span>}
          </div>
        </div>
      </fieldset>
      <fieldset className="panel">
        <legend>Arms</legend>
        <div className="grid filters">
          <FilterNumber id={uid + "-reach"} label="Reach at least" unit="mm" value={minReach} onChange={setMinReach} />
          <FilterNumber id={uid + "-payload"} label="Rated payload at least" unit="kg" value={minPayload} onChange={setMinPayload} />
          <div className="field">
            <label htmlFor={uid + "-axes"}>Axis count</label>
            <select id={uid + "-axes"} value={axes} onChange={(e) => setAxes(e.target.value)}>
              <option value="any">any</option>
              {axisCounts.map((n) => (
                <option key={n} value={String(n)}>
                  {n}
                </option>
              ))}
            </select>
          </div>
          <div className="field">
            <label htmlFor={uid + "-ip"}>IP code at least</label>
            <input id={uid + "-ip"} type="text" placeholder="e.g. IP54" value={minIp} onChange={(e) => setMinIp(e.target.value)} />
          </div>
          <FilterNumber id={uid + "-price"} label="Price at most" unit={priceUnit} value={maxPrice} onChange={setMaxPrice} />
        </div>
        {filterErrors.length > 0 && <p className="err">{filterErrors.join("; ")}</p>}
        <div className="toolbar">
          <span className="sub">
            {shown.length} of {arms.length} arms shown, {chosen.size} chosen
          </span>
          <button type="button" onClick={() => setChosen(new Set([...chosen, ...shown.map((a) => a.id)]))}>
            Choose all shown
          </button>
          <button type="button" onClick={() => setChosen(new Set())} disabled={chosen.size === 0}>
            Clear choice
          </button>
        </div>
        <div className="table-wrap">
          <table data-testid="catalog">
            <thead>
              <tr>
                <th scope="col">Choose</th>
                <th scope="col">Arm</th>
                <th scope="col" className="num">Axes</th>
                <th scope="col" className="num">Reach (mm)</th>
                <th scope="col" className="num">Rated payload (kg)</th>
                <th scope="col">IP code</th>
                <th scope="col" className="num">Price</th>
                <th scope="col" className="num">Revision</th>
              </tr>
            </thead>
            <tbody>
              {shown.map((a) => (
                <tr key={a.id}>
                  <td>
                    <input type="checkbox" id={`${uid}-arm-${a.id}`} checked={chosen.has(a.id)} onChange={(e) => toggle(a.id, e.target.checked)} aria-label={`Choose ${a.name}`} />
                  </td>
                  <td>
                    <label htmlFor={`${uid}-arm-${a.id}`}>{a.name}</label>
                    <span className="sub"> {[a.maker, a.modelCode].filter(Boolean).join(" · ")}</span>
                  </td>
                  <td className="num">{a.axes}</td>
                  <td className="num">{a.specs.reach !== undefined ? Math.round(a.specs.reach * 1000) : "–"}</td>
                  <td className="num">{a.specs.ratedPayload ?? "–"}</td>
                  <td>{a.specs.ipCode ?? "–"}</td>
                  <td className="num">{price(a.specs.price, a.specs.currency)}</td>
                  <td className="num">{a.revision}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
        {err("armIds") && <p className="err">{err("armIds")}</p>}
      </fieldset>
      <div className="save-bar">
        <button type="submit" className="primary" disabled={busy}>
          {busy ? "Creating…" : "Create shortlist and analyse"}
        </button>
        <span aria-live="polite" role="status">
          {problem && <span className="err">{problem}</span>}
        </span>
      </div>
    </form>
  );
}
