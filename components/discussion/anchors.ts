import "server-only";
import { getPins, loadPinnedInputs } from "@/lib/db/shortlists";
import { SPEC_FIELDS } from "@/shared/schemas/requirements";
import type { AnchorOption } from "./DiscussionPanel";

/** What comments on a shortlist can be about: the shortlist, its arms, targets, paths and compliance rows. */
export async function shortlistAnchors(shortlistId: string): Promise<AnchorOption[]> {
  const out: AnchorOption[] = [{ type: "shortlist", id: null, label: "the whole shortlist" }];
  const pins = await getPins(shortlistId);
  if (!pins) return out;
  const { arms, requirementSet } = await loadPinnedInputs(pins);
  for (const a of arms) out.push({ type: "arm", id: a.id, label: `arm: ${a.arm.name}` });
  for (const t of requirementSet.targets) out.push({ type: "target", id: t.name, label: `target: ${t.name}` });
  for (const p of requirementSet.paths) out.push({ type: "path", id: p.name, label: `path: ${p.name}` });
  for (const a of arms) {
    requirementSet.specs.forEach((s, i) => {
      out.push({ type: "compliance", id: `${a.id}#${i}`, label: `compliance: ${a.arm.name} / ${SPEC_FIELDS[s.field].label}` });
    });
  }
  return out;
}
