import type { StoredResult } from "@/lib/analysis/stored";

/**
 * Messages from an analysis thread to the thread that started it. The result arrives in its
 * stored form (compacted, split per arm and compressed in the analysis thread; the arms' bytes
 * are transferred, not copied), so the thread that writes it to the database never serialises it.
 */
export type ThreadMessage =
  | { type: "progress"; fraction: number; stage: string }
  | { type: "done"; result: StoredResult }
  | { type: "error"; message: string };
