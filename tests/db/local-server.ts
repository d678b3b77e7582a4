// Child process of runs.test.ts: a stand-in web server whose local runner analyses one run until
// the test kills the process (`node --import tsx --conditions=react-server local-server.ts <runId>`).
import { LocalRunner } from "@/lib/jobs/local-runner";

new LocalRunner({ concurrency: 1 }).submit(process.argv[2]);
setInterval(() => {}, 1000);
