import type { ShortlistAnalysis } from "@/lib/analysis/shortlist";

/** Messages from an analysis thread to the thread that started it. */
export type ThreadMessage =
  | { type: "progress"; fraction: number; stage: string }
  | { type: "done"; result: ShortlistAnalysis }
  | { type: "error"; message: string };
