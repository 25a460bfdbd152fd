import { Form } from "react-router";
import { Button } from "~/components/ui/button";
import { Panel } from "~/components/ui/page-header";
import { approvalWaits } from "~/domain/steps";
import { STEP_STATUS_LABELS, type StepKey } from "~/domain/vocabulary";
import type { reviewState, caseSignatures } from "~/services/review.server";
import { formatUtc } from "~/utils/format";
import { SsoSignButton } from "~/components/case/sso-sign-button";

type StepReview = Awaited<ReturnType<typeof reviewState>>[number];
type CaseSignature = Awaited<ReturnType<typeof caseSignatures>>[number];

/**
 * One step under review: its state and revision, every signature given on it (voided ones struck
 * through with the reason), its thread, and the forms the person's roles allow: comment, submit,
 * approve with a signature, or return.
 */
export function StepReviewPanel({ step: s, index: i, selfId, canSubmit, canCheck, canSso, busy, waitsFor }: { step: StepReview; index: number; selfId: string; canSubmit: boolean; canCheck: boolean; canSso: boolean; busy: boolean; waitsFor: StepKey[] }) {
  const ownRevision = s.revisionAuthorId === selfId;
  return (
    <Panel title={`${i + 1}. ${s.label}`}>
      <div className="grid grid-cols-1 gap-4 lg:grid-cols-[minmax(0,1fr)_20rem]">
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
          {canSubmit && (s.status === "draft" || s.status === "returned") ? (
            <Form method="post" className="space-y-2">
              <input type="hidden" name="intent" value="submit" />
              <input type="hidden" name="step" value={s.key} />
              <textarea name="comment" rows={2} placeholder="Note for the checker (optional)" aria-label={`Note with the submission of ${s.label}`} className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
              <label className="block text-sm font-semibold" htmlFor={`pw-submit-${s.key}`}>
                Your password, to sign as preparer
              </label>
              <input id={`pw-submit-${s.key}`} name="password" type="password" autoComplete="current-password" className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
              <Button type="submit" name="confirm" value="password" disabled={busy}>
                Submit {s.label.toLowerCase()} for check
              </Button>
              {canSso ? <SsoSignButton busy={busy} label={`Submit ${s.label.toLowerCase()} with company sign-in`} /> : null}
            </Form>
          ) : null}
          {canCheck && s.status === "submitted" ? (
            ownRevision ? (
              <p className="text-sm text-warn">You edited this revision: another checker must approve or return it.</p>
            ) : (
              <>
                {waitsFor.length ? (
                  <p className="text-sm text-ink-muted">{approvalWaits(s.key, waitsFor)}</p>
                ) : (
                  <Form method="post" className="space-y-2 rounded border border-line p-3">
                    <input type="hidden" name="intent" value="approve" />
                    <input type="hidden" name="step" value={s.key} />
                    <label className="block text-sm font-semibold" htmlFor={`pw-${s.key}`}>
                      Your password, to sign
                    </label>
                    <input id={`pw-${s.key}`} name="password" type="password" autoComplete="current-password" className="w-full rounded border border-line-strong px-2 py-1 text-sm" />
                    <Button type="submit" name="confirm" value="password" disabled={busy}>
                      Approve {s.label.toLowerCase()} (sign: checked)
                    </Button>
                    {canSso ? <SsoSignButton busy={busy} label={`Approve ${s.label.toLowerCase()} with company sign-in`} /> : null}
                  </Form>
                )}
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
}

/** The checker's signature on the whole case once every step is approved. */
export function CaseApprovalPanel({ signatures, approvedForIssue, allApproved, canCheck, canSso, busy }: { signatures: CaseSignature[]; approvedForIssue: boolean; allApproved: boolean; canCheck: boolean; canSso: boolean; busy: boolean }) {
  return (
    <Panel title="Approval for issue">
      {signatures.length ? (
        <ul className="mb-3 space-y-1 text-xs">
          {signatures.map((g) => (
            <li key={g.id} className={g.voided ? "text-ink-faint line-through" : "text-status-approved"}>
              ✓ {g.meaning} by {g.name} ({g.role}), {formatUtc(g.signedAt)}, hash <code>{g.revisionHash.slice(0, 16)}…</code>
              {g.voided ? <span className="ml-1 font-semibold text-warn no-underline"> — voided: {g.voided.reason}</span> : null}
            </li>
          ))}
        </ul>
      ) : null}
      {approvedForIssue ? (
        <p className="text-sm">The case is approved for issue: the engineer can request the report on the Reports page.</p>
      ) : allApproved && canCheck ? (
        <Form method="post" className="flex flex-wrap items-end gap-2">
          <input type="hidden" name="intent" value="approve-case" />
          <label className="text-sm">
            <span className="block font-semibold">Your password, to sign</span>
            <input name="password" type="password" autoComplete="current-password" className="rounded border border-line-strong px-2 py-1" />
          </label>
          <Button type="submit" name="confirm" value="password" disabled={busy}>
            Approve the case for issue (sign)
          </Button>
          {canSso ? <SsoSignButton busy={busy} label="Approve for issue with company sign-in" /> : null}
        </Form>
      ) : (
        <p className="text-sm text-ink-muted">Once every step is approved, a checker signs the case as approved for issue.</p>
      )}
    </Panel>
  );
}
