// Child process of arms.test.ts: one save from revision 1, as a second server process would do.
import { getArm, updateArm } from "@/lib/db/arms";
import { ConflictError } from "@/lib/db/errors";

async function main(): Promise<void> {
  const [id, name] = process.argv.slice(2);
  const current = await getArm(id);
  if (!current) throw new Error(`arm ${id} not found`);
  try {
    const r = await updateArm(null, id, 1, { ...current.arm, name });
    console.log(JSON.stringify({ outcome: "saved", revision: r.revision }));
  } catch (err) {
    if (!(err instanceof ConflictError)) throw err;
    console.log(JSON.stringify({ outcome: "conflict", currentRevision: err.currentRevision }));
  }
}

main().catch((err) => {
  console.error(err);
  process.exit(1);
});
