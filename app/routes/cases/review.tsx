import { Form, useNavigation } from "react-router";
import { z } from "zod";
import { requireCase } from "~/auth/case-access.server";
import { hasPermission } from "~/domain/permissions";
import { STEP_KEYS, STEP_STATUS_LABELS } from "~/domain/vocabulary";
import { Button } from "~/components/ui/button";
import { Alert, PageHeader, Panel } from "~/components/ui/page-header";
import { buildCaseFile, caseInputs, resultsFor } from "~/services/analysis.server";
import { getCaseSteps } from "~/services/case-steps.server";
import { flaggedCases, undispositioned } from "~/services/distribution.server";
import { addComment, approveCaseForIssue, approveStep, caseSignatures, confirmIdentity, returnStep, reviewState, submitStep } from "~/services/review.server";
import { formatUtc } from "~/utils/format";
import { accepted, answer, forbidden, parseBody, refused } from "~/utils/http.server";
import type { Route } from "./+types/review";
import { DomainError } from "~/domain/errors";

const step = z.enum(STEP_KEYS, "Unknown step");
const ReviewActionSchema = z.discriminatedUnion("intent", [
  z.strictObject({ intent: z.literal("submit"), step, comment: z.string().max(4000, "At most 4000 characters").default("") }),
  z.strictObject({ intent: z.literal("approve"), step, password: z.string().max(256).default(""), comment: z.string().max(4000, "At most 4000 characters").default("") }),
  z.strictObject({ intent: z.literal("return"), step, comment: z.string().trim().min(3, "Say what needs to change: a comment is required").max(4000, "At most 4000 characters"), anchor: z.string().max(200).default("") }),
  z.strictObject({ intent: z.literal("comment"), step, body: z.string().trim().min(1, "Write a comment").max(4000, "At most 4000 characters"), anchor: z.string().max(200).default("") }),
  z.strictObject({ intent: z.literal("approve-case"), password: z.string().max(256).default("") }),
]);

export async function loader({ request, params }: Route.LoaderArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const [steps, caseSigs] = await Promise.all([reviewState(c.id), caseSignatures(c.id)]);
  return {
    caseId: c.id,
    steps,
    caseSignatures: caseSigs,
    selfId: current.user.id,
    canSubmit: hasPermission(current.roles, "case:edit"),
    canCheck: hasPermission(current.roles, "step:check"),
    allApproved: steps.every((s) => s.status === "approved"),
    approvedForIssue: caseSigs.some((s) => s.meaning === "approved for issue" && !s.voided),
  };
}

/** Flagged cases without a disposition keep the distribution step from being submitted. */
async function distributionBlockers(caseId: string, title: string): Promise<string[]> {
  const inputs = caseInputs(await getCaseSteps(caseId));
  try {
    const { result } = await resultsFor(caseId, buildCaseFile(title, inputs, "envelope"), null);
    const open = undispositioned(flaggedCases(result), inputs.distribution);
    return open.length ? [`Disposition every flagged case first (exclude, or justify with a comment): ${open.join(", ")}.`] : [];
  } catch (error) {
    if (error instanceof DomainError) return [error.message];
    throw error;
  }
}

export async function action({ request, params }: Route.ActionArgs) {
  const { current, case: c } = await requireCase(request, params.caseId, "case:read");
  const parsed = await parseBody(request, ReviewActionSchema);
  if (!parsed.ok) return refused(parsed.fieldErrors);
  const v = parsed.value;
  const need = (ok: boolean, what: string) => {
    if (!ok) forbidden(`Your role does not allow this (${what}).`);
  };
  return answer(async () => {
    if (v.intent === "submit") {
      need(hasPermission(current.roles, "case:edit"), "submitting needs the engineer role");
      await submitStep({ caseId: c.id, step: v.step, actor: current.user, comment: v.comment, blockers: v.step === "distribution" ? await distributionBlockers(c.id, c.title) : [] });
      return accepted(`${v.step} submitted for check.`);
    }
    if (v.intent === "approve") {
      need(hasPermission(current.roles, "step:check"), "approving needs the checker role");
      const confirmedBy = await confirmIdentity(current, v.password || undefined);
      await approveStep({ caseId: c.id, step: v.step, current, role: "checker", confirmedBy, comment: v.comment });
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
    const confirmedBy = await confirmIdentity(current, v.password || undefined);
    await approveCaseForIssue({ caseId: c.id, current, role: "checker", confirmedBy });
    return accepted("Case approved for issue and signed.");
  });
}

export default function ReviewRoute({ loaderData, actionData }: Route.ComponentProps) {
  const busy = useNavigation().state === "submitting";
  return (
    <>
      <PageHeader title="Review" description="Each step is submitted by its engineer, then checked: approved with a signature, or returned with comments. Nobody approves a revision they edited." />
      {actionData?.message ? <div className="mb-4"><Alert tone={actionData.ok ? "info" : "danger"}>{actionData.message}</Alert></div> : null}
      {actionData && !actionData.ok && !actionData.message ? <div className="mb-4"><Alert>{Object.values(actionData.fieldErrors).flat().join(" ")}</Alert></div> : null}
      <div className="space-y-4">
        {loaderData.steps.map((s, i) => {
          const ownRevision = s.revisionAuthorId === loaderData.selfId;
          return (
            <Panel key={s.key} title={`${i + 1}. ${s.label}`}>
              <div className="grid gap-4 lg:grid-cols-[1fr_20rem]">
                <div>
                  <p className="mb-2 text-sm">
                    <strong>
                      <span aria-hidden="true">{STEP_STATUS_LABELS[s.status].icon}</span> {STEP_STATUS_LABELS[s.status].label}
                    </strong>
                    {s.revision ? ` · revision ${s.revision}${s.revisionAuthor ? ` by ${s.revisionAuthor}` : ""}` : ""}
                  </p>
                  {s.signatures.length ? (
                    <ul className="mb-3 space-y-1 text-xs">
                      {s.signatures.map((g) => (
                        <li key={g.id} className={g.voided ? "text-ink-faint line-through" : "text-status-approved"}>
                          ✓ {g.meaning} by {g.name} ({g.role}), {formatUtc(g.signedAt)}, revision {g.revision}, hash <code>{g.revisionHash.slice(0, 16)}…</code>
                          {g.voided ? <span className="ml-1 font-semibold text-warn no-underline"> — voided: {g.voided.reason}</span> : null}
                        </li>
                      ))}
                    </ul>
                  ) : null}
                  <ol className="space-y-2 text-sm" aria-label={`Thread of ${s.label}`}>
                    {s.comments.map((c) => (
                      <li key={c.id} className={`rounded border px-3 py-2 ${c.kind === "returned" ? "border-warn/40 bg-warn-soft" : c.kind === "approved" ? "border-status-approved/30 bg-[#e8f4ec]" : "border-line bg-canvas"}`}>
                        <span className="block text-xs text-ink-muted">
                          {c.author} · {c.kind} · rev. {c.revision} · {formatUtc(c.at)}
                          {c.anchor ? ` · on ${c.anchor}` : ""}
                        </span>
                        <span className="whitespace-pre-wrap">{c.body}</span>
                      </li>
                    ))}
                  </ol>
                  <Form method="post" className="mt-2 flex flex-wrap items-end gap-2 text-sm">
                    <input type="hidden" name="intent" value="comment" />
                    <input type="hidden" name="step" value={s.key} />
                    <input name="anchor" placeholder="On (field or row)" aria-label={`Comment on which field or row of ${s.label}`} className="w-40 rounded border border-line-strong px-2 py-1" />
                    <input name="body" placeholder="Comment" aria-label={`Comment on ${s.label}`} className="min-w-48 flex-1 rounded border border-line-strong px-2 py-1" />
                    <Button type="submit" variant="secondary" disabled={busy}>
                      Comment
                    </Button>
                  </Form>
                </div>
                <div className="space-y-3">
                  {loaderData.canSubmit && (s.status === "draft" || s.status === "returned") ? (
                    <Form method="post" className="space-y-2">
                      <input type="hidden" name="intent" value="submit" />
                      <input type="hidden" name="step" value={s.key} />
                      <textarea name="comment" rows={2} placeholder="Note for the checker (optional)" aria-label={`Note with the submission of ${s.label}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                      <Button type="submit" disabled={busy}>
                        Submit {s.label.toLowerCase()} for check
                      </Button>
                    </Form>
                  ) : null}
                  {loaderData.canCheck && s.status === "submitted" ? (
                    ownRevision ? (
                      <p className="text-sm text-warn">You edited this revision: another checker must approve or return it.</p>
                    ) : (
                      <>
                        <Form method="post" className="space-y-2 rounded border border-line p-3">
                          <input type="hidden" name="intent" value="approve" />
                          <input type="hidden" name="step" value={s.key} />
                          <label className="block text-sm font-semibold" htmlFor={`pw-${s.key}`}>
                            Your password, to sign
                          </label>
                          <input id={`pw-${s.key}`} name="password" type="password" autoComplete="current-password" className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                          <Button type="submit" disabled={busy}>
                            Approve {s.label.toLowerCase()} (sign: checked)
                          </Button>
                        </Form>
                        <Form method="post" className="space-y-2 rounded border border-line p-3">
                          <input type="hidden" name="intent" value="return" />
                          <input type="hidden" name="step" value={s.key} />
                          <input name="anchor" placeholder="On (field or row), optional" aria-label={`Returned item of ${s.label}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                          <textarea name="comment" rows={2} required placeholder="What needs to change" aria-label={`Reason for returning ${s.label}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                          <Button type="submit" variant="danger" disabled={busy}>
                            Return {s.label.toLowerCase()}
                          </Button>
                        </Form>
                      </>
                    )
                  ) : null}
                </div>
              </div>
            </Panel>
          );
        })}
        <Panel title="Approval for issue">
          {loaderData.caseSignatures.length ? (
            <ul className="mb-3 space-y-1 text-xs">
              {loaderData.caseSignatures.map((g) => (
                <li key={g.id} className={g.voided ? "text-ink-faint line-through" : "text-status-approved"}>
                  ✓ {g.meaning} by {g.name} ({g.role}), {formatUtc(g.signedAt)}, hash <code>{g.revisionHash.slice(0, 16)}…</code>
                  {g.voided ? <span className="ml-1 font-semibold text-warn no-underline"> — voided: {g.voided.reason}</span> : null}
                </li>
              ))}
            </ul>
          ) : null}
          {loaderData.approvedForIssue ? (
            <p className="text-sm">The case is approved for issue: the engineer can request the report on the Reports page.</p>
          ) : loaderData.allApproved && loaderData.canCheck ? (
            <Form method="post" className="flex flex-wrap items-end gap-2">
              <input type="hidden" name="intent" value="approve-case" />
              <label className="text-sm">
                <span className="block font-semibold">Your password, to sign</span>
                <input name="password" type="password" autoComplete="current-password" className="rounded border border-line-strong px-2 py-1" />
              </label>
              <Button type="submit" disabled={busy}>
                Approve the case for issue (sign)
              </Button>
            </Form>
          ) : (
            <p className="text-sm text-ink-muted">Once every step is approved, a checker signs the case as approved for issue.</p>
          )}
        </Panel>
      </div>
    </>
  );
}

export function meta() {
  return [{ title: "Review · Spanwright" }];
}
