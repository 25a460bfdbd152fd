import { useSaving, useSettledAnswer } from "~/components/forms/use-saving";
import { requireCase } from "~/auth/case-access.server";
import { canSignWithSso, sign } from "~/auth/signing.server";
import { hasPermission } from "~/domain/permissions";
import { Alert, PageHeader } from "~/components/ui/page-header";
import { signatureOutcomeMessage } from "~/domain/sso";
import { addComment, caseSignatures, returnStep, reviewState } from "~/services/review.server";
import { accepted, answer, clientAddress, forbidden, parseBody, refused } from "~/utils/http.server";
import { ErrorPanel } from "~/components/ui/error-panel";
import type { Route } from "./+types/review";
import { GREEK_TEXT } from "~/utils/page-fonts";
import { CaseApprovalPanel, StepReviewPanel } from "./review.panels";
import { ReviewActionSchema } from "./review.schema";

export async function loader({ request, params, context }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const [steps, caseSigs, canSso] = await Promise.all([reviewState(c.id), caseSignatures(c.id), canSignWithSso(current)]);
  return {
    caseId: c.id,
    // How a signature through company sign-in ended (a fixed message for a code in the URL).
    signature: signatureOutcomeMessage(new URL(request.url).searchParams.get("signature")),
    canSso,
    steps,
    caseSignatures: caseSigs,
    selfId: current.user.id,
    canSubmit: hasPermission(current.roles, "case:edit"),
    canCheck: hasPermission(current.roles, "step:check"),
    allApproved: steps.every((s) => s.status === "approved"),
    approvedForIssue: caseSigs.some((s) => s.meaning === "approved for issue" && !s.voided),
  };
}

export async function action({ request, params, context }: Route.ActionArgs) {
  const { current, case: c } = await requireCase({ request, context }, params.caseId, "case:read");
  const parsed = await parseBody(request, ReviewActionSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const v = parsed.value;
  const need = (ok: boolean, what: string) => {
    if (!ok) forbidden(`Your role does not allow this (${what}).`);
  };
  return answer(async () => {
    if (v.intent === "submit") {
      need(hasPermission(current.roles, "case:edit"), "submitting needs the engineer role");
      await sign(current, { intent: "submit", caseId: c.id, step: v.step, comment: v.comment }, { ...v, address: clientAddress(request) });
      return accepted(`${v.step} submitted for check and signed as prepared.`);
    }
    if (v.intent === "approve") {
      need(hasPermission(current.roles, "step:check"), "approving needs the checker role");
      await sign(current, { intent: "approve", caseId: c.id, step: v.step, comment: v.comment }, { ...v, address: clientAddress(request) });
      return accepted(`${v.step} approved and signed.`);
    }
    if (v.intent === "return") {
      need(hasPermission(current.roles, "step:check"), "returning needs the checker role");
      await returnStep({ caseId: c.id, step: v.step, actor: current.user, comment: v.comment, anchor: v.anchor });
      return accepted(`${v.step} returned to the engineer.`);
    }
    if (v.intent === "comment") {
      await addComment({ caseId: c.id, step: v.step, actor: current.user, body: v.body, anchor: v.anchor });
      return accepted("Comment added.");
    }
    need(hasPermission(current.roles, "step:check"), "approving for issue needs the checker role");
    await sign(current, { intent: "approve-case", caseId: c.id }, { ...v, address: clientAddress(request) });
    return accepted("Case approved for issue and signed.");
  });
}

export default function ReviewRoute({ loaderData, actionData }: Route.ComponentProps) {
  const shown = useSettledAnswer(actionData);
  const busy = useSaving();
  return (
    <>
      <PageHeader title="Review" description="Each step is submitted by its engineer, who signs it as prepared, then checked: approved with a signature, or returned with comments. Nobody approves a revision they edited or a case they prepared." />
      {loaderData.signature && !actionData ? <div className="mb-4"><Alert tone={loaderData.signature.ok ? "info" : "danger"}>{loaderData.signature.message}</Alert></div> : null}
      {shown?.message ? <div className="mb-4"><Alert tone={shown.ok ? "info" : "danger"}>{shown.message}</Alert></div> : null}
      {shown && !shown.ok && !shown.message ? <div className="mb-4"><Alert>{Object.values(shown.fieldErrors).flat().join(" ")}</Alert></div> : null}
      <div className="space-y-4">
        {loaderData.steps.map((s, i) => (
          <StepReviewPanel key={s.key} step={s} index={i} selfId={loaderData.selfId} canSubmit={loaderData.canSubmit} canCheck={loaderData.canCheck} canSso={loaderData.canSso} busy={busy} waitsFor={loaderData.steps.slice(0, i).filter((u) => u.status !== "approved").map((u) => u.key)} />
        ))}
        <CaseApprovalPanel signatures={loaderData.caseSignatures} approvedForIssue={loaderData.approvedForIssue} allApproved={loaderData.allApproved} canCheck={loaderData.canCheck} canSso={loaderData.canSso} busy={busy} />
      </div>
    </>
  );
}

// Its text has Greek letters: root.tsx preloads the Greek face with the document.
export const handle = GREEK_TEXT;

export function meta() {
  return [{ title: "Review · Spanwright" }];
}

export function ErrorBoundary({ error }: Route.ErrorBoundaryProps) {
  return <ErrorPanel error={error} />;
}
