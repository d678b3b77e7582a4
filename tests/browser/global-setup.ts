/**
 * Global set-up of the browser project: builds the production server when there is no build or a
 * source file is newer than it (tests/helpers/build-freshness.ts), once, before any test file
 * starts, so `npm run test:browser` never drives stale pages and the build is not cut short by a
 * hook's time limit.
 */
import { ensureBuild } from "./harness";

export default function setup(): void {
  ensureBuild();
}
