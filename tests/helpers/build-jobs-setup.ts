// globalSetup: the compiled analysis programs (dist/jobs) are current before tests start runs.
import { execFileSync } from "node:child_process";
import path from "node:path";

export default function setup(): void {
  execFileSync(process.execPath, [path.resolve(__dirname, "..", "..", "scripts", "build-jobs.mjs")], { stdio: "inherit" });
}
