/** `import-urdf`: a URDF file's serial chain as an arm file (`chain` convention) on stdout. */
import { createHash } from "node:crypto";
import { readFileSync, statSync } from "node:fs";
import path from "node:path";
import { importUrdf, UrdfError, URDF_LIMITS } from "@/lib/urdf";
import { CliError, parseOptions, required, type CliCommand } from "../io";
import { count } from "@/shared/format";

export const command: CliCommand = {
  usage: "import-urdf --file robot.urdf [--base LINK] [--tip LINK]  → the arm file (JSON)",
  run(argv) {
    const options = parseOptions(argv, ["file", "base", "tip"]);
    const file = required(options, "file");
    const field = `--file ${file}`;
    let bytes: Buffer;
    try {
      const size = statSync(file).size;
      if (size > URDF_LIMITS.bytes) throw new CliError(field, `is ${count(size)} bytes; the limit is 2 MiB (${count(URDF_LIMITS.bytes)} bytes)`);
      bytes = readFileSync(file);
    } catch (e) {
      if (e instanceof CliError) throw e;
      throw new CliError(field, `cannot read the file (${(e as NodeJS.ErrnoException).code ?? "error"})`);
    }
    let text: string;
    try {
      text = new TextDecoder("utf-8", { fatal: true }).decode(bytes);
    } catch {
      throw new CliError(field, "is not UTF-8 text");
    }
    try {
      const { arm } = importUrdf(text, {
        base: options.get("base"),
        tip: options.get("tip"),
        fileName: path.basename(file),
        sha256: createHash("sha256").update(bytes).digest("hex"),
      });
      return JSON.stringify(arm, null, 2) + "\n";
    } catch (e) {
      if (e instanceof UrdfError) throw new CliError(`${field}: ${e.element}`, e.reason);
      throw e;
    }
  },
};
