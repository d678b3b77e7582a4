/**
 * URDF benchmark (`npm run bench`): time to import and export the invented reference files, and
 * time to refuse hostile or oversized files (the target is well under 1 s each, so a request never
 * ties up the server). Wall-clock on this machine; reported, never asserted.
 */
import { readFileSync } from "node:fs";
import path from "node:path";
import { exportUrdf, importUrdf, UrdfError } from "@/lib/urdf";

function best(fn: () => void, reps: number): number {
  let t = Infinity;
  for (let i = 0; i < reps; i++) {
    const s = performance.now();
    fn();
    t = Math.min(t, performance.now() - s);
  }
  return t;
}

function refuse(text: string): () => void {
  return () => {
    try {
      importUrdf(text);
    } catch (e) {
      if (e instanceof UrdfError) return;
      throw e;
    }
    throw new Error("accepted");
  };
}

export async function run(): Promise<void> {
  const dir = path.join(__dirname, "..", "tests", "reference", "urdf");
  const rows: [string, number][] = [];
  for (const f of ["slanted-six.urdf", "rail-wrist.urdf", "twin-branch.urdf"]) {
    const text = readFileSync(path.join(dir, f), "utf8");
    rows.push([`import ${f}`, best(() => importUrdf(text), 20)]);
    const arm = importUrdf(text).arm;
    rows.push([`export ${f}`, best(() => exportUrdf(arm), 20)]);
  }
  const links = Array.from({ length: 199 }, (_, i) => `<link name="l${i}"><inertial><mass value="1"/><inertia ixx="1" iyy="1" izz="1"/></inertial><visual><geometry><box size="1 1 1"/></geometry></visual><collision><geometry><box size="1 1 1"/></geometry></collision></link>`).join("\n");
  const joints = Array.from({ length: 198 }, (_, i) => `<joint name="j${i}" type="${i % 17 ? "fixed" : "revolute"}"><origin xyz="0 0 0.1"/><parent link="l${i}"/><child link="l${i + 1}"/><axis xyz="0 0 1"/><limit lower="-1" upper="1" effort="1" velocity="1"/></joint>`).join("\n");
  const largest = `<robot name="big">${links}${joints}</robot>`;
  rows.push([`import a 199-link file (${(largest.length / 1024).toFixed(0)} KiB)`, best(() => importUrdf(largest), 5)]);
  const hostile: [string, string][] = [
    ["billion laughs", `<!DOCTYPE r [<!ENTITY a "aaaaaaaaaa"><!ENTITY b "&a;&a;&a;&a;&a;&a;&a;&a;&a;&a;">]><robot name="&b;"/>`],
    ["20 MB", `<robot name="x">${" ".repeat(20 * 1024 * 1024)}</robot>`],
    ["10 000 joints", `<robot name="x">${"<joint name=\"j\" type=\"fixed\"><parent link=\"a\"/><child link=\"b\"/></joint>".repeat(10_000)}</robot>`],
    ["2 MiB near the element limit", `<robot name="x">${"<a/>".repeat(19_000)}${" ".repeat(2_000_000)}</robot>`.slice(0, 2 * 1024 * 1024 - 10)],
    ["nested 1000 deep", `<robot name="x">${"<x>".repeat(1000)}${"</x>".repeat(1000)}</robot>`],
    ["a 60 KiB attribute", `<robot name="${"x".repeat(60_000)}"><link name="a"/></robot>`],
    ["a 60 000-digit number", `<robot name="x"><link name="a"><inertial><mass value="${"1".repeat(60_000)}x"/></inertial></link></robot>`],
  ];
  for (const [label, text] of hostile) rows.push([`refuse ${label}`, best(refuse(text), 3)]);
  console.log("\nURDF import and export, best of several runs (target: every refusal well under 1 s)");
  const w = Math.max(...rows.map((r) => r[0].length));
  for (const [label, ms] of rows) console.log(`${label.padEnd(w)}  ${ms.toFixed(2).padStart(8)} ms`);
}
