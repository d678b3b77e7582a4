/**
 * Command-line entry (`npm run --silent cli -- <command> …`, docs/cli.md): a dispatch table from
 * command names to modules in cli/commands. Every command runs the same library code as the
 * server. Bad input exits with status 2 and one line on stderr naming the field and the reason.
 * To add a command, add one line to `COMMANDS`.
 */
import { CliError, type CliCommand } from "./io";

const COMMANDS: Record<string, () => Promise<CliCommand>> = {
  fk: () => import("./commands/fk").then((m) => m.command),
  jacobian: () => import("./commands/jacobian").then((m) => m.command),
  ik: () => import("./commands/ik").then((m) => m.command),
  statics: () => import("./commands/statics").then((m) => m.command),
  analyze: () => import("./commands/analyze").then((m) => m.command),
  clearance: () => import("./commands/clearance").then((m) => m.command),
  "import-urdf": () => import("./commands/import-urdf").then((m) => m.command),
  "export-urdf": () => import("./commands/export-urdf").then((m) => m.command),
  cycle: () => import("./commands/cycle").then((m) => m.command),
  place: () => import("./commands/place").then((m) => m.command),
};

async function main(argv: readonly string[]): Promise<number> {
  const [name, ...rest] = argv;
  if (name === undefined || name === "help" || name === "--help") {
    const lines = ["usage: armsift <command> [options]", ""];
    for (const key of Object.keys(COMMANDS)) lines.push(`  ${(await COMMANDS[key]()).usage}`);
    process.stdout.write(lines.join("\n") + "\n");
    return name === undefined ? 2 : 0;
  }
  const load = Object.prototype.hasOwnProperty.call(COMMANDS, name) ? COMMANDS[name] : undefined;
  if (!load) {
    process.stderr.write(`command: unknown command "${name}" (known: ${Object.keys(COMMANDS).join(", ")})\n`);
    return 2;
  }
  try {
    const command = await load();
    const output = await command.run(rest);
    process.stdout.write(typeof output === "string" ? output : JSON.stringify(output) + "\n");
    return 0;
  } catch (e) {
    if (e instanceof CliError || e instanceof RangeError) {
      process.stderr.write(`${e.message.split("\n")[0]}\n`);
      return 2;
    }
    throw e;
  }
}

main(process.argv.slice(2)).then(
  (code) => {
    process.exitCode = code;
  },
  (e: unknown) => {
    process.stderr.write(`internal error: ${e instanceof Error ? e.message : String(e)}\n`);
    process.exitCode = 1;
  },
);
