/**
 * What a share-link guest sees of a shortlist, built field by field from an allow-list (never by
 * removing fields from the members' data): names and pinned revisions, the latest finished
 * analysis as a ranking, target and path verdicts and the compliance table, and the caution.
 * With "hide prices" the price requirements, the arms' price values and the price sub-score are
 * left out, and the ranking is recomputed without the price weight, so no figure or order derived
 * from a price reaches the guest.
 */
import "server-only";
import { can, type LinkGuest } from "@/lib/auth/permissions";
import { subScoreOf, SUB_SCORE_KEYS } from "@/lib/analysis/ranking";
import { rerank } from "@/lib/analysis/shortlist";
import { requirementText } from "@/lib/analysis/spec";
import { price } from "@/shared/format";
import type { Verdict } from "@/lib/analysis/types";
import { getSharedShortlist } from "@/lib/db";


interface GuestVisibility {
  access: "view" | "comment";
  hidePrices: boolean;
  /** Sentences shown on the share view: what guests can and cannot see or do. */
  statements: string[];
}

export interface GuestShortlistView {
  shortlist: { name: string; requirement: { name: string; revision: number }; arms: { id: string; name: string; revision: number; price: string | null }[] };
  visibility: GuestVisibility;
  caution: string | null;
  analysis: null | {
    finishedAt: string | null;
    ranking: { rank: number; armId: string; name: string; score: number; disqualified: boolean; failedMusts: string[]; hiddenFailedMusts: number }[];
    targets: { name: string; cells: { armId: string; verdict: Verdict; reason: string }[] }[];
    paths: { name: string; cells: { armId: string; verdict: Verdict; reason: string }[] }[];
    compliance: { index: number; label: string; priority: string; cells: { armId: string; value: string; verdict: Verdict; reason: string }[] }[];
    subScores: { key: string; cells: { armId: string; value: number; applicable: boolean }[] }[];
  };
}

function guestVisibility(guest: LinkGuest): GuestVisibility {
  const prices = can(guest, "price:read");
  const statements = [
    "Guests see this shortlist only: its name, the requirement set and arm revisions it pins, the latest finished analysis (ranking, target and path verdicts, spec compliance) and the discussion.",
    "Guests do not see arm documents, other shortlists, the members' email addresses, the history of edits or the audit trail.",
    prices
      ? "Prices are shown: arm prices, price requirements and the price part of the score."
      : "Prices are hidden: no arm prices, no price requirements, no price sub-score; the ranking shown is computed without the price weight, so it can differ from the team's. An arm that fails a price requirement shows that it failed one, without figures.",
    guest.access === "comment"
      ? "Guests may add comments and replies under a display name of their choice; they cannot edit, delete or resolve comments."
      : "Guests may read the discussion but not write in it.",
  ];
  return { access: guest.access, hidePrices: !prices, statements };
}

/** The guest's view of the link's shortlist, or null when it is gone. */
export async function shortlistForGuest(guest: LinkGuest): Promise<GuestShortlistView | null> {
  const prices = can(guest, "price:read", { shortlistId: guest.shortlistId });
  const data = await getSharedShortlist(guest.shortlistId, { prices });
  if (!data) return null;
  const { shortlist: s, run, result } = data;
  const view: GuestShortlistView = {
    shortlist: {
      name: s.name,
      requirement: { name: s.requirement.name, revision: s.requirement.revision },
      arms: s.arms.map((a) => ({ id: a.armId, name: a.name, revision: a.revision, price: null })),
    },
    visibility: guestVisibility(guest),
    caution: null,
    analysis: null,
  };
  if (prices) {
    for (const a of view.shortlist.arms) {
      const sp = data.specs.get(a.id);
      if (sp?.price !== undefined && sp.price !== null) a.price = price(sp.price, sp.currency);
    }
  }
  if (!run || !result) return view;
  view.caution = result.caution;
  const names = new Map(result.arms.map((a) => [a.id, a.name]));
  const shownSpec = (field: string) => prices || field !== "price";
  const weights = prices ? result.weights : { ...result.weights, price: 0 };
  const ranking = prices
    ? result.ranking
    : rerank(result, weights);
  const byArm = new Map(result.arms.map((a) => [a.id, a]));
  view.analysis = {
    finishedAt: run.finishedAt ? run.finishedAt.toISOString() : null,
    ranking: ranking.map((r) => {
      const arm = byArm.get(r.armId);
      const failed = (arm?.specs ?? []).filter((sp) => sp.priority === "must" && sp.verdict === "fails");
      return {
        rank: r.rank, armId: r.armId, name: names.get(r.armId) ?? r.armId, score: r.score, disqualified: r.disqualified,
        failedMusts: failed.filter((sp) => shownSpec(sp.field)).map((sp) => sp.label),
        hiddenFailedMusts: failed.filter((sp) => !shownSpec(sp.field)).length,
      };
    }),
    targets: result.requirementSet.targets.map((name, i) => ({
      name, cells: result.arms.map((a) => ({ armId: a.id, verdict: a.targets[i]?.verdict ?? "unknown", reason: a.targets[i]?.reason ?? a.error ?? "" })),
    })),
    paths: result.requirementSet.paths.map((name, i) => ({
      name, cells: result.arms.map((a) => ({ armId: a.id, verdict: a.paths[i]?.verdict ?? "unknown", reason: a.paths[i]?.reason ?? a.error ?? "" })),
    })),
    compliance: result.requirementSet.specs.flatMap((_, i) => {
      const sp = result.arms.map((a) => a.specs.find((x) => x.index === i)).find((x) => x !== undefined);
      if (!sp || !shownSpec(sp.field)) return [];
      return [{
        index: i,
        label: requirementText(sp),
        priority: sp.priority,
        cells: result.arms.map((a) => {
          const c = a.specs.find((x) => x.index === i);
          return { armId: a.id, value: c ? `${c.valueDisplay}${c.displayUnit ? ` ${c.displayUnit}` : ""}` : "", verdict: c?.verdict ?? "unknown", reason: c?.reason ?? "" };
        }),
      }];
    }),
    subScores: SUB_SCORE_KEYS.filter((k) => prices || k !== "price").map((key) => ({
      key, cells: result.arms.map((a) => ({ armId: a.id, value: subScoreOf(a.subScores, key).value, applicable: subScoreOf(a.subScores, key).applicable })),
    })),
  };
  return view;
}
