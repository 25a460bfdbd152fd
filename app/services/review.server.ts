import { href } from "react-router";
import { and, asc, desc, eq, inArray, isNull, sql } from "drizzle-orm";
import { STEPS, approvalWaits, downstreamOf, stepIndex } from "~/domain/steps";
import { canonicalJson, sha256Hex, writeAudit } from "~/db/audit.server";
import { db, prepared, type Db, type Tx } from "~/db/client.server";
import { caseSteps, cases, memberships, signatureVoids, signatures, stepComments, stepRevisions, users } from "~/db/schema";
import type { Role, SignatureMeaning, StepKey } from "~/domain/vocabulary";
import { env } from "~/utils/env.server";
import { sendMail } from "./mail.server";
import type { Actor, CurrentUser } from "~/domain/people";
import { DomainError } from "~/domain/errors";


/** The hash a step signature carries: the canonical serialisation of exactly the revision signed. */
export function stepRevisionHash(caseId: string, step: StepKey, revision: number, data: unknown): string {
  return sha256Hex(canonicalJson({ caseId, step, revision, data }));
}

/** The hash a case approval carries: every step's signed revision hash, in step order. */
export function caseApprovalHash(caseId: string, stepHashes: Record<StepKey, string>): string {
  return sha256Hex(canonicalJson({ caseId, steps: STEPS.map((s) => [s.key, stepHashes[s.key]]) }));
}

async function members(organisationId: string, role: Role) {
  const rows = await db
    .select({ email: users.email, name: users.name, roles: memberships.roles })
    .from(memberships)
    .innerJoin(users, eq(users.id, memberships.userId))
    .where(and(eq(memberships.organisationId, organisationId), eq(users.disabled, false)));
  return rows.filter((r) => r.roles.includes(role));
}

/** Notifications never undo the change they announce: a mail failure is logged, not thrown. */
async function notify(organisationId: string, to: string[], subject: string, paragraphs: string[], path: string) {
  for (const address of to) {
    await sendMail({ to: address, organisationId, subject, paragraphs, link: { href: `${env().APP_ORIGIN}${path}`, label: "Open in Spanwright" } }).catch((error: unknown) =>
      console.warn(`mail to ${address} not sent: ${error instanceof Error ? error.message : String(error)}`),
    );
  }
}

async function lockStep(tx: Tx, caseId: string, step: StepKey) {
  const [row] = await tx.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step))).for("update");
  if (!row || row.revision === 0) throw new DomainError("This step has not been saved yet.", { field: "step", kind: "conflict" });
  return row;
}

/** Every person who wrote a revision of the case (or of one step of it). */
export async function revisionAuthors(database: Db | Tx, caseId: string, step?: StepKey): Promise<Set<string>> {
  const rows = await database
    .selectDistinct({ id: stepRevisions.createdBy })
    .from(stepRevisions)
    .where(step ? and(eq(stepRevisions.caseId, caseId), eq(stepRevisions.step, step)) : eq(stepRevisions.caseId, caseId));
  return new Set(rows.map((r) => r.id));
}

/** A signature that would bind something other than what the person saw when they asked to sign. */
function changedSince(expected: string | undefined, actual: string): void {
  if (expected !== undefined && expected !== actual) {
    throw new DomainError("What you asked to sign has changed since: look at it again and sign anew.", { field: "revision", kind: "conflict" });
  }
}

/** The submitted revision of a step and the hash a "checked" signature on it carries. */
async function submittedRevision(database: Db | Tx, caseId: string, step: StepKey) {
  const [row] = await database.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step)));
  if (!row || row.status !== "submitted") throw new DomainError("Only a submitted step can be approved.", { field: "status", kind: "conflict" });
  const [rev] = await database.select().from(stepRevisions).where(and(eq(stepRevisions.caseId, caseId), eq(stepRevisions.step, step), eq(stepRevisions.revision, row.revision)));
  if (!rev) throw new DomainError("The revision to approve was not found.", { field: "revision", kind: "conflict" });
  return { row, rev, hash: stepRevisionHash(caseId, step, row.revision, rev.data) };
}

/** The hash an "approved for issue" signature carries: every step's live check, once all are approved and the case is not yet approved. */
async function approvalHash(database: Db | Tx, caseId: string): Promise<string> {
  const live = await liveSignatures(caseId, database);
  if (live.some((s) => s.meaning === "approved for issue")) throw new DomainError("The case is already approved for issue.", { field: "case", kind: "conflict" });
  const hashes = {} as Record<StepKey, string>;
  for (const s of STEPS) {
    const sig = live.find((x) => x.step === s.key && x.meaning === "checked");
    if (!sig) throw new DomainError(`The ${s.key} step has no valid check signature.`, { field: "steps", kind: "conflict" });
    hashes[s.key] = sig.revisionHash;
  }
  return caseApprovalHash(caseId, hashes);
}

/**
 * What a signature would bind if made now, as the signer is shown it when they ask to sign: the
 * submitted revision of a step ("checked") or every step's check ("approved for issue"). A
 * signature completed later with this as `expectedHash` is refused if it changed meanwhile.
 * @throws DomainError conflict when there is nothing to sign
 */
export async function signatureTarget(input: { caseId: string; step?: StepKey }, database: Db | Tx = db): Promise<string> {
  return input.step ? (await submittedRevision(database, input.caseId, input.step)).hash : approvalHash(database, input.caseId);
}

/** The draft or returned revision of a step and the hash a "prepared" signature on it carries. */
async function submittableRevision(database: Db | Tx, caseId: string, step: StepKey) {
  const [row] = await database.select().from(caseSteps).where(and(eq(caseSteps.caseId, caseId), eq(caseSteps.step, step)));
  if (!row || row.revision === 0) throw new DomainError("This step has not been saved yet.", { field: "step", kind: "conflict" });
  if (row.status !== "draft" && row.status !== "returned") throw new DomainError(`This step is ${row.status}; only a draft or returned step can be submitted.`, { field: "status", kind: "conflict" });
  const [rev] = await database.select().from(stepRevisions).where(and(eq(stepRevisions.caseId, caseId), eq(stepRevisions.step, step), eq(stepRevisions.revision, row.revision)));
  if (!rev) throw new DomainError("The revision to submit was not found.", { field: "revision", kind: "conflict" });
  return { row, hash: stepRevisionHash(caseId, step, row.revision, rev.data) };
}

/** What a "prepared" signature would bind if the step were submitted now (see signatureTarget). */
export async function submissionTarget(input: { caseId: string; step: StepKey }, database: Db | Tx = db): Promise<string> {
  return (await submittableRevision(database, input.caseId, input.step)).hash;
}

/**
 * Submits a saved step for check, signed by the engineer who submits it (meaning "prepared", on the
 * hash of exactly the revision submitted, the one the checker will sign): it becomes read-only for
 * the engineer and the checkers are told. `blockers` are refusals found before (flagged cases
 * without a disposition). `expectedHash`, when given, is the revision hash the signer was shown.
 */
export async function submitStep(
  input: { caseId: string; step: StepKey; current: CurrentUser; role: Role; confirmedBy: "password" | "sso"; comment?: string; blockers?: string[]; expectedHash?: string },
  database: Db | Tx = db,
) {
  if (input.blockers?.length) throw new DomainError(input.blockers.join(" "), { field: "step", kind: "conflict" });
  const actor = input.current.user;
  const result = await database.transaction(async (tx) => {
    await lockStep(tx, input.caseId, input.step);
    const { row, hash: revisionHash } = await submittableRevision(tx, input.caseId, input.step);
    changedSince(input.expectedHash, revisionHash);
    const [c] = await tx.select().from(cases).where(eq(cases.id, input.caseId));
    const [sig] = await tx
      .insert(signatures)
      .values({ organisationId: c!.organisationId, caseId: input.caseId, step: input.step, revision: row.revision, signerId: actor.id, signerName: actor.name, role: input.role, meaning: "prepared", confirmedBy: input.confirmedBy, revisionHash })
      .returning();
    await tx.update(caseSteps).set({ status: "submitted" }).where(eq(caseSteps.id, row.id));
    await tx.insert(stepComments).values({ caseId: input.caseId, step: input.step, revision: row.revision, authorId: actor.id, kind: "submitted", body: input.comment?.trim() || "Submitted for check." });
    const [updated] = await tx.update(cases).set({ status: "submitted", updatedAt: new Date() }).where(eq(cases.id, input.caseId)).returning();
    await writeAudit(tx, { organisationId: c!.organisationId, actor, action: `step.${input.step}.submit`, entityType: "case", entityId: input.caseId, after: { signatureId: sig!.id, step: input.step, revision: row.revision, revisionHash, meaning: "prepared" } });
    return { case: updated!, revision: row.revision };
  });
  const checkers = await members(result.case.organisationId, "checker");
  await notify(
    result.case.organisationId,
    checkers.map((c) => c.email),
    `${result.case.reference}: ${input.step} submitted for check`,
    [`${actor.name} (${actor.email}) prepared and submitted the ${input.step} step of ${result.case.reference} (${result.case.title}), revision ${result.revision}, for your check.`],
    href("/cases/:caseId/review", { caseId: input.caseId }),
  );
}

/** Whether the person signed any step of the case as its preparer (voided signatures count: they prepared it). */
async function preparedCase(tx: Tx, caseId: string, userId: string): Promise<boolean> {
  const rows = await tx.select({ id: signatures.id }).from(signatures).where(and(eq(signatures.caseId, caseId), eq(signatures.meaning, "prepared"), eq(signatures.signerId, userId))).limit(1);
  return rows.length > 0;
}

/** Returns a submitted step to the engineer with the checker's comments. */
export async function returnStep(input: { caseId: string; step: StepKey; actor: Actor; comment: string; anchor?: string }, database: Db | Tx = db) {
  if (input.comment.trim().length < 3) throw new DomainError("Say what needs to change: a comment is required to return a step.", { field: "comment" });
  const result = await database.transaction(async (tx) => {
    const row = await lockStep(tx, input.caseId, input.step);
    if (row.status !== "submitted") throw new DomainError("Only a submitted step can be returned.", { field: "status", kind: "conflict" });
    await tx.update(caseSteps).set({ status: "returned" }).where(eq(caseSteps.id, row.id));
    await tx.insert(stepComments).values({ caseId: input.caseId, step: input.step, revision: row.revision, authorId: input.actor.id, kind: "returned", anchor: input.anchor?.trim() || null, body: input.comment.trim() });
    const [c] = await tx.update(cases).set({ status: "returned", updatedAt: new Date() }).where(eq(cases.id, input.caseId)).returning();
    await writeAudit(tx, { organisationId: c!.organisationId, actor: input.actor, action: `step.${input.step}.return`, entityType: "case", entityId: input.caseId, after: { step: input.step, revision: row.revision, comment: input.comment.trim() } });
    const [author] = await tx.select({ email: users.email }).from(stepRevisions).innerJoin(users, eq(users.id, stepRevisions.createdBy)).where(and(eq(stepRevisions.caseId, input.caseId), eq(stepRevisions.step, input.step), eq(stepRevisions.revision, row.revision)));
    return { case: c!, revision: row.revision, author: author?.email };
  });
  if (result.author) {
    await notify(result.case.organisationId, [result.author], `${result.case.reference}: ${input.step} returned`, [`${input.actor.email} returned the ${input.step} step of ${result.case.reference}, revision ${result.revision}, with this comment:`, input.comment.trim()], href("/cases/:caseId/review", { caseId: input.caseId }));
  }
}

/**
 * Approves a submitted step with a signature (meaning "checked"). Refused to anyone who wrote any
 * revision of the step: nobody checks their own work. `expectedHash`, when given, is the revision
 * hash the signer was shown; a different current revision is refused.
 */
export async function approveStep(input: { caseId: string; step: StepKey; current: CurrentUser; role: Role; confirmedBy: "password" | "sso"; comment?: string; expectedHash?: string }, database: Db | Tx = db) {
  const actor = input.current.user;
  const result = await database.transaction(async (tx) => {
    await lockStep(tx, input.caseId, input.step);
    const { row, rev, hash: revisionHash } = await submittedRevision(tx, input.caseId, input.step);
    const waiting = await unapprovedBefore(tx, input.caseId, input.step);
    if (waiting.length) throw new DomainError(approvalWaits(input.step, waiting), { field: "step", kind: "conflict" });
    if ((await revisionAuthors(tx, input.caseId, input.step)).has(actor.id)) {
      throw new DomainError("You wrote a revision of this step: another checker must approve it (separation of duties).", { field: "step", kind: "forbidden" });
    }
    if (await preparedCase(tx, input.caseId, actor.id)) {
      throw new DomainError("You signed this case as its preparer: another checker must approve it (separation of duties).", { field: "step", kind: "forbidden" });
    }
    changedSince(input.expectedHash, revisionHash);
    const [c] = await tx.select().from(cases).where(eq(cases.id, input.caseId));
    const [sig] = await tx
      .insert(signatures)
      .values({ organisationId: c!.organisationId, caseId: input.caseId, step: input.step, revision: row.revision, signerId: actor.id, signerName: actor.name, role: input.role, meaning: "checked", confirmedBy: input.confirmedBy, revisionHash })
      .returning();
    await tx.update(caseSteps).set({ status: "approved" }).where(eq(caseSteps.id, row.id));
    await tx.insert(stepComments).values({ caseId: input.caseId, step: input.step, revision: row.revision, authorId: actor.id, kind: "approved", body: input.comment?.trim() || "Checked and approved." });
    const statuses = await tx.select({ status: caseSteps.status }).from(caseSteps).where(eq(caseSteps.caseId, input.caseId));
    const open = statuses.some((s) => s.status === "submitted");
    await tx.update(cases).set({ status: open ? "submitted" : statuses.length === STEPS.length && statuses.every((s) => s.status === "approved") ? "approved" : "draft", updatedAt: new Date() }).where(eq(cases.id, input.caseId));
    await writeAudit(tx, { organisationId: c!.organisationId, actor, action: `step.${input.step}.approve`, entityType: "case", entityId: input.caseId, after: { signatureId: sig!.id, step: input.step, revision: row.revision, revisionHash, meaning: "checked" } });
    return { case: c!, revision: row.revision, author: rev.createdBy };
  });
  const [author] = await database.select({ email: users.email }).from(users).where(eq(users.id, result.author));
  if (author) await notify(result.case.organisationId, [author.email], `${result.case.reference}: ${input.step} approved`, [`${actor.name} checked and approved the ${input.step} step of ${result.case.reference}, revision ${result.revision}.`], href("/cases/:caseId/review", { caseId: input.caseId }));
}

/**
 * The steps before `step` that are not approved. A step rests on those before it (the envelope on
 * the basis and the planform, the loads on everything), so a checker approves them in order.
 */
export async function unapprovedBefore(database: Db | Tx, caseId: string, step: StepKey): Promise<StepKey[]> {
  const rows = await database.select({ step: caseSteps.step, status: caseSteps.status }).from(caseSteps).where(eq(caseSteps.caseId, caseId));
  return STEPS.slice(0, stepIndex(step))
    .map((s) => s.key)
    .filter((key) => rows.find((r) => r.step === key)?.status !== "approved");
}

/**
 * The live signatures an edit of `step` voids: the preparer's and checker's signatures of it and of
 * every step downstream (they rest on it), and the case's approval for issue.
 */
function voidedByEdit(live: Awaited<ReturnType<typeof liveSignatures>>, step: StepKey) {
  const affected: StepKey[] = [step, ...downstreamOf(step)];
  return live.filter((s) => (s.step !== null && affected.includes(s.step) && (s.meaning === "checked" || s.meaning === "prepared")) || (s.step === null && s.reportId === null && s.meaning === "approved for issue"));
}

/**
 * What saving a change to `step` would void, in words, for the warning the step page shows before
 * anyone saves: "checked by Marek Oduya on planform", "approved for issue by Marek Oduya".
 */
export async function signaturesVoidedByEdit(caseId: string, step: StepKey, database: Db | Tx = db): Promise<string[]> {
  return voidedByEdit(await liveSignatures(caseId, database), step).map((s) => (s.step ? `${s.meaning} by ${s.signerName} on ${s.step}` : `${s.meaning} by ${s.signerName}`));
}

/** Signatures not voided, newest first, for a case. */
export async function liveSignatures(caseId: string, database: Tx | typeof db = db) {
  const rows = await database
    .select({ sig: signatures, voidId: signatureVoids.id })
    .from(signatures)
    .leftJoin(signatureVoids, eq(signatureVoids.signatureId, signatures.id))
    .where(eq(signatures.caseId, caseId))
    .orderBy(desc(signatures.signedAt));
  return rows.filter((r) => !r.voidId).map((r) => r.sig);
}

/**
 * The checker's signature on the whole case ("approved for issue") once every step is approved;
 * its hash binds the signed revision hash of every step. Only then may a report be requested.
 * Nobody who wrote any revision of the case approves it for issue (separation of duties).
 */
export async function approveCaseForIssue(input: { caseId: string; current: CurrentUser; role: Role; confirmedBy: "password" | "sso"; expectedHash?: string }, database: Db | Tx = db) {
  const actor = input.current.user;
  const approved = await database.transaction(async (tx) => {
    if ((await revisionAuthors(tx, input.caseId)).has(actor.id)) {
      throw new DomainError("You wrote revisions of this case: another checker must approve it for issue (separation of duties).", { field: "case", kind: "forbidden" });
    }
    if (await preparedCase(tx, input.caseId, actor.id)) {
      throw new DomainError("You signed this case as its preparer: another checker must approve it for issue (separation of duties).", { field: "case", kind: "forbidden" });
    }
    const steps = await tx.select().from(caseSteps).where(eq(caseSteps.caseId, input.caseId)).for("update");
    if (steps.length < STEPS.length || steps.some((s) => s.status !== "approved")) throw new DomainError("Every step must be approved before the case is approved for issue.", { field: "steps", kind: "conflict" });
    const revisionHash = await approvalHash(tx, input.caseId);
    const [c] = await tx.select().from(cases).where(eq(cases.id, input.caseId));
    changedSince(input.expectedHash, revisionHash);
    const [sig] = await tx
      .insert(signatures)
      .values({ organisationId: c!.organisationId, caseId: input.caseId, signerId: actor.id, signerName: actor.name, role: input.role, meaning: "approved for issue", confirmedBy: input.confirmedBy, revisionHash })
      .returning();
    await writeAudit(tx, { organisationId: c!.organisationId, actor, action: "case.approve-for-issue", entityType: "case", entityId: input.caseId, after: { signatureId: sig!.id, revisionHash } });
    return c!;
  });
  // The engineers request the report: they are told the case may now be issued.
  const engineers = await members(approved.organisationId, "engineer");
  await notify(
    approved.organisationId,
    engineers.map((e) => e.email),
    `${approved.reference}: approved for issue`,
    [`${actor.name} signed ${approved.reference} (${approved.title}) as approved for issue. An engineer of the case can now request the report on its Reports page.`],
    href("/cases/:caseId/reports", { caseId: input.caseId }),
  );
}

/**
 * Called inside the transaction of every step save: an edit voids the signatures of that step, of
 * every step downstream of it, and the case's approval for issue. The voided steps go back to draft
 * (a submitted one too: its preparer's signature no longer stands, so it is submitted again) and the
 * reason is written into each step's thread.
 */
export async function voidApprovalsAfterEdit(tx: Tx, input: { caseId: string; step: StepKey; revision: number; actor: Actor }) {
  const toVoid = voidedByEdit(await liveSignatures(input.caseId, tx), input.step);
  if (toVoid.length === 0) return [];
  const reason = `${input.step} changed to revision ${input.revision} by ${input.actor.email}`;
  await tx.insert(signatureVoids).values(toVoid.map((s) => ({ signatureId: s.id, reason, voidedBy: input.actor.id })));
  const voidedSteps = [...new Set(toVoid.map((s) => s.step).filter((s): s is StepKey => s !== null))];
  if (voidedSteps.length) {
    await tx.update(caseSteps).set({ status: "draft" }).where(and(eq(caseSteps.caseId, input.caseId), inArray(caseSteps.step, voidedSteps), inArray(caseSteps.status, ["approved", "submitted"])));
    const rows = await tx.select().from(caseSteps).where(and(eq(caseSteps.caseId, input.caseId), inArray(caseSteps.step, voidedSteps)));
    await tx.insert(stepComments).values(rows.map((r) => ({ caseId: input.caseId, step: r.step, revision: r.revision, authorId: input.actor.id, kind: "comment" as const, body: `Signatures voided: ${reason}.` })));
  }
  return toVoid.map((s) => s.id);
}

export async function addComment(input: { caseId: string; step: StepKey; actor: Actor; body: string; anchor?: string }, database: Db | Tx = db) {
  if (input.body.trim().length === 0) throw new DomainError("Write a comment.", { field: "body" });
  await database.transaction(async (tx) => {
    const [row] = await tx.select().from(caseSteps).where(and(eq(caseSteps.caseId, input.caseId), eq(caseSteps.step, input.step)));
    const [c] = await tx.select().from(cases).where(eq(cases.id, input.caseId));
    await tx.insert(stepComments).values({ caseId: input.caseId, step: input.step, revision: row?.revision ?? 0, authorId: input.actor.id, kind: "comment", anchor: input.anchor?.trim() || null, body: input.body.trim() });
    await writeAudit(tx, { organisationId: c!.organisationId, actor: input.actor, action: `step.${input.step}.comment`, entityType: "case", entityId: input.caseId, after: { body: input.body.trim(), anchor: input.anchor ?? null } });
  });
}

/** Everything the review page shows: per step, its state, thread and signatures (voided ones marked). */
export async function reviewState(caseId: string, database: Db | Tx = db) {
  const [steps, comments, sigs, revs] = await Promise.all([
    database.select({ step: caseSteps.step, status: caseSteps.status, revision: caseSteps.revision }).from(caseSteps).where(eq(caseSteps.caseId, caseId)),
    database.select({ c: stepComments, author: users.name }).from(stepComments).innerJoin(users, eq(users.id, stepComments.authorId)).where(eq(stepComments.caseId, caseId)).orderBy(asc(stepComments.createdAt)),
    stepSignatures(caseId, database),
    database.select({ step: stepRevisions.step, revision: stepRevisions.revision, createdBy: stepRevisions.createdBy, author: users.name }).from(stepRevisions).innerJoin(users, eq(users.id, stepRevisions.createdBy)).where(eq(stepRevisions.caseId, caseId)),
  ]);
  return STEPS.map((s) => {
    const row = steps.find((r) => r.step === s.key);
    const revision = row?.revision ?? 0;
    const current = revs.find((r) => r.step === s.key && r.revision === revision);
    return {
      key: s.key,
      label: s.label,
      status: row?.status ?? "empty",
      revision,
      revisionAuthorId: current?.createdBy ?? null,
      revisionAuthor: current?.author ?? null,
      comments: comments.filter((c) => c.c.step === s.key).map((c) => ({ id: c.c.id, kind: c.c.kind, revision: c.c.revision, anchor: c.c.anchor, body: c.c.body, author: c.author, at: c.c.createdAt })),
      signatures: sigs.filter((x) => x.step === s.key),
    };
  });
}

function stepSignaturesQuery(database: Db | Tx) {
  return database.select({ sig: signatures, void: signatureVoids }).from(signatures).leftJoin(signatureVoids, eq(signatureVoids.signatureId, signatures.id)).where(and(eq(signatures.caseId, sql.placeholder("caseId")), isNull(signatures.reportId))).orderBy(desc(signatures.signedAt));
}

// The case overview makes this read on every view: built once (see `prepared`).
const stepSignaturesPrepared = prepared((database) => stepSignaturesQuery(database).prepare("step_signatures"));

/** Every step signature of the case (not those of reports), newest first, voided ones marked. */
export async function stepSignatures(caseId: string, database: Db | Tx = db) {
  const rows = await (database === db ? stepSignaturesPrepared() : stepSignaturesQuery(database)).execute({ caseId });
  return rows.map((x) => ({ step: x.sig.step, ...signatureView(x.sig, x.void) }));
}

export async function caseSignatures(caseId: string, database: Db | Tx = db) {
  const rows = await database.select({ sig: signatures, void: signatureVoids }).from(signatures).leftJoin(signatureVoids, eq(signatureVoids.signatureId, signatures.id)).where(and(eq(signatures.caseId, caseId), isNull(signatures.step), isNull(signatures.reportId))).orderBy(desc(signatures.signedAt));
  return rows.map((x) => signatureView(x.sig, x.void));
}

function signatureView(sig: typeof signatures.$inferSelect, v: typeof signatureVoids.$inferSelect | null) {
  return { id: sig.id, name: sig.signerName, role: sig.role, meaning: sig.meaning as SignatureMeaning, signedAt: sig.signedAt, revision: sig.revision, revisionHash: sig.revisionHash, confirmedBy: sig.confirmedBy, voided: v ? { reason: v.reason, at: v.voidedAt } : null };
}
