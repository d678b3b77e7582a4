/** Something a comment can be about. `id` null = the whole shortlist. */
export interface AnchorOption {
  type: "shortlist" | "arm" | "target" | "path" | "compliance";
  id: string | null;
  label: string;
}

/**
 * What comments on a shortlist can be about, in the order the discussion lists them: the whole
 * shortlist, each arm, each target, each path, then each arm against each compliance row
 * (`armId#index`). Members and link guests get their lists from here.
 */
export function anchorOptions(src: {
  arms: { id: string; name: string }[];
  targets: string[];
  paths: string[];
  compliance: { index: number; label: string }[];
}): AnchorOption[] {
  return [
    { type: "shortlist", id: null, label: "the whole shortlist" },
    ...src.arms.map((a): AnchorOption => ({ type: "arm", id: a.id, label: `arm: ${a.name}` })),
    ...src.targets.map((t): AnchorOption => ({ type: "target", id: t, label: `target: ${t}` })),
    ...src.paths.map((p): AnchorOption => ({ type: "path", id: p, label: `path: ${p}` })),
    ...src.arms.flatMap((a) => src.compliance.map((c): AnchorOption => ({ type: "compliance", id: `${a.id}#${c.index}`, label: `compliance: ${a.name} / ${c.label}` }))),
  ];
}
