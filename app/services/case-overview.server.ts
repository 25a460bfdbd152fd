import { describeCaseEvent, STEPS } from "~/domain/steps";
import { db, type Db, type Tx } from "~/db/client.server";
import { formatUtc } from "~/utils/format";
import { caseHistory } from "./audit.server";
import type { StepMeta } from "./case-steps.server";
import type { StepKey } from "~/domain/vocabulary";
import { stepSignatures } from "./review.server";

/**
 * What the case overview shows: each step with its state, who changed it last and its check (the
 * live signature, or the reason its approval was voided), and the case's history in words. The
 * step states come from the caller, who has them from the page's shared read (the case header needs them too).
 */
export async function caseOverview(caseId: string, steps: Record<StepKey, StepMeta>, database: Db | Tx = db) {
  const [history, signatures] = await Promise.all([caseHistory(caseId, 20, database), stepSignatures(caseId, database)]);
  const approval = (key: string) => {
    // The check only: the preparer's signature is on the review page.
    const sigs = signatures.filter((g) => g.step === key && g.meaning === "checked");
    const live = sigs.find((g) => !g.voided);
    if (live) return { kind: "signed" as const, text: `${live.meaning} by ${live.name}, ${formatUtc(live.signedAt)}` };
    const voided = sigs.find((g) => g.voided);
    return voided ? { kind: "voided" as const, text: `approval voided: ${voided.voided!.reason}` } : null;
  };
  return {
    steps: STEPS.map((s) => ({ ...s, status: steps[s.key].status, revision: steps[s.key].revision, updatedAt: steps[s.key].updatedAt, updatedByName: steps[s.key].updatedByName, approval: approval(s.key) })),
    history: history.map((h) => ({ id: h.id, at: h.at, what: describeCaseEvent(h.action), action: h.action, who: h.actorName ?? h.actorEmail ?? "the system", actorEmail: h.actorEmail })),
  };
}
