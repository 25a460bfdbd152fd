import { and, eq, gt, isNull } from "drizzle-orm";
import { redirect, href } from "react-router";
import { sha256Hex, writeAudit } from "~/db/audit.server";
import { db } from "~/db/client.server";
import { signingRequests, users } from "~/db/schema";
import { DomainError } from "~/domain/errors";
import type { CurrentUser } from "~/domain/people";
import type { SignatureOutcome } from "~/domain/sso";
import type { Role, StepKey } from "~/domain/vocabulary";
import { releaseReport, releaseTarget } from "~/services/reports.server";
import { submissionBlockers } from "~/services/distribution.server";
import { approveCaseForIssue, approveStep, signatureTarget, submissionTarget, submitStep } from "~/services/review.server";
import { reconfirmPassword } from "./reconfirm.server";
import { beginSso, ssoEnabled, type SsoFlow, type SsoIdentity } from "./sso.server";

/*
 * Signatures, each with its own proof of identity at the moment of signing. How long ago the
 * person signed in counts for nothing. The proof is either
 *  - the signer's password, given with the signature (throttled and audited: reconfirm.server.ts), or
 *  - a new round trip to the company identity provider that forces it to authenticate the person
 *    afresh (prompt=login, max_age=0), checked by the ID token's auth_time and bound to that one
 *    signature by a nonce and a single-use signing request that fixes what is signed (its hash).
 *
 * The API, for a route that signs:
 *   await sign(current, what, { confirm: "password" | "sso", password, address })
 * signs with the password, or throws the redirect to the identity provider (the callback route
 * completes the signature and returns to `signingPage(what)?signature=<outcome>`).
 * `canSignWithSso(current)` says whether to offer the company sign-in button.
 *
 * To add a kind of signature: add its variant to SignatureRequest and its entry to KINDS (role,
 * words for the audit trail, the hash it would bind now, and the service that records it with
 * `expectedHash`), and its intent to the signing_requests.intent type in db/schema.ts.
 */

/** What a person asks to sign. */
export type SignatureRequest =
  | { intent: "submit"; caseId: string; step: StepKey; comment?: string }
  | { intent: "approve"; caseId: string; step: StepKey; comment?: string }
  | { intent: "approve-case"; caseId: string }
  | { intent: "release"; caseId: string; reportId: string };

type Intent = SignatureRequest["intent"];
type RequestOf<I extends Intent> = Extract<SignatureRequest, { intent: I }>;
type Proof = { confirmedBy: "password" | "sso"; expectedHash?: string };

interface SignatureKind<I extends Intent> {
  role: Role;
  /** The page the person signs from and returns to. */
  page: "review" | "reports";
  /** What is being done, for the audit trail ("check the basis step"). */
  what(request: RequestOf<I>): string;
  /** The hash the signature would bind if made now. @throws DomainError when there is nothing to sign */
  target(current: CurrentUser, request: RequestOf<I>): Promise<string>;
  /** Records the signature; refuses it if `expectedHash` is given and no longer what would be signed. */
  sign(current: CurrentUser, request: RequestOf<I>, proof: Proof): Promise<void>;
}

const KINDS: { [I in Intent]: SignatureKind<I> } = {
  submit: {
    role: "engineer",
    page: "review",
    what: (r) => `prepare and submit the ${r.step} step`,
    // A blocked submission is refused before any round trip to the identity provider.
    target: async (current, r) => {
      const blockers = await submissionBlockers(current.organisation.id, r.caseId, r.step);
      if (blockers.length) throw new DomainError(blockers.join(" "), { field: "step", kind: "conflict" });
      return submissionTarget({ caseId: r.caseId, step: r.step });
    },
    sign: async (current, r, proof) =>
      submitStep({ current, role: "engineer", caseId: r.caseId, step: r.step, comment: r.comment, blockers: await submissionBlockers(current.organisation.id, r.caseId, r.step), ...proof }),
  },
  approve: {
    role: "checker",
    page: "review",
    what: (r) => `check the ${r.step} step`,
    target: (_, r) => signatureTarget({ caseId: r.caseId, step: r.step }),
    sign: (current, r, proof) => approveStep({ current, role: "checker", caseId: r.caseId, step: r.step, comment: r.comment, ...proof }),
  },
  "approve-case": {
    role: "checker",
    page: "review",
    what: () => "approve the case for issue",
    target: (_, r) => signatureTarget({ caseId: r.caseId }),
    sign: (current, r, proof) => approveCaseForIssue({ current, role: "checker", caseId: r.caseId, ...proof }),
  },
  release: {
    role: "quality",
    page: "reports",
    what: () => "release a report",
    target: (current, r) => releaseTarget({ reportId: r.reportId, caseId: r.caseId, organisationId: current.organisation.id }),
    sign: (current, r, proof) => releaseReport({ current, role: "quality", reportId: r.reportId, caseId: r.caseId, organisationId: current.organisation.id, ...proof }),
  },
};

function kindOf<I extends Intent>(request: RequestOf<I>): SignatureKind<I> {
  return KINDS[request.intent] as unknown as SignatureKind<I>;
}

/** The round trip to the identity provider may take this long. */
export const SSO_SIGNATURE_TTL_MS = 10 * 60 * 1000;
/** Clock difference allowed between the provider's auth_time and our own clock. */
export const AUTH_TIME_SKEW_S = 30;

/** Where the person signed from, and where they go back to afterwards. */
export function signingPage(request: SignatureRequest): string {
  return href(`/cases/:caseId/${kindOf(request).page}`, { caseId: request.caseId });
}

/** Whether the person can sign with the identity provider: it is configured, this is a browser session, and their account is linked to it. */
export async function canSignWithSso(current: CurrentUser): Promise<boolean> {
  if (!ssoEnabled() || current.sessionId.startsWith("token:")) return false;
  const [u] = await db.select({ sub: users.ssoSubject }).from(users).where(eq(users.id, current.user.id));
  return Boolean(u?.sub);
}

/**
 * Signs what the person asked to sign, with the proof they chose: their password given now, or a
 * fresh company sign-in (throws the redirect to the identity provider; the callback signs).
 * @throws DomainError unauthenticated (wrong or missing password), too-many (held back after wrong
 *   ones), forbidden (separation of duties), conflict or not-found (nothing to sign)
 */
export async function sign(current: CurrentUser, request: SignatureRequest, proof: { confirm: "password" | "sso"; password?: string; address: string }): Promise<void> {
  if (proof.confirm === "sso") {
    const { url, setCookie } = await beginSsoSignature(current, request);
    throw redirect(url, { headers: { "Set-Cookie": setCookie } });
  }
  await signWithPassword(current, request, proof.password || undefined, proof.address);
}

/** Signs after the signer's own password, given now (throttled; a wrong one is audited). */
export async function signWithPassword(current: CurrentUser, request: SignatureRequest, password: string | undefined, address: string): Promise<void> {
  const kind = kindOf(request);
  await reconfirmPassword({ current, password, purpose: "signature", about: { entityType: "case", entityId: request.caseId, what: kind.what(request) }, address });
  await kind.sign(current, request, { confirmedBy: "password" });
}

/**
 * Starts a signature proven by the identity provider: records what is to be signed (its hash as
 * it stands now) and a nonce, for this person and this session only, and returns the provider URL
 * that asks for a fresh authentication with the flow cookie.
 * @throws DomainError when the account is not linked to company sign-in, or there is nothing to sign
 */
export async function beginSsoSignature(current: CurrentUser, request: SignatureRequest): Promise<{ url: string; setCookie: string }> {
  if (!(await canSignWithSso(current))) {
    throw new DomainError("Your account is not linked to company sign-in: sign in with company sign-in once, or sign with your password.", { field: "password", kind: "invalid" });
  }
  const targetHash = await kindOf(request).target(current, request);
  const nonce = sha256Hex(crypto.getRandomValues(new Uint8Array(32)));
  const [row] = await db
    .insert(signingRequests)
    .values({
      userId: current.user.id,
      sessionId: current.sessionId,
      organisationId: current.organisation.id,
      caseId: request.caseId,
      intent: request.intent,
      step: request.intent === "approve" || request.intent === "submit" ? request.step : null,
      reportId: request.intent === "release" ? request.reportId : null,
      comment: request.intent === "approve" || request.intent === "submit" ? (request.comment ?? "") : "",
      targetHash,
      nonceHash: sha256Hex(nonce),
      expiresAt: new Date(Date.now() + SSO_SIGNATURE_TTL_MS),
    })
    .returning();
  return beginSso({ kind: "signature", requestId: row!.id, nonce, loginHint: current.user.email });
}

async function auditRefusal(current: CurrentUser, caseId: string, after: Record<string, unknown>) {
  await db.transaction((tx) =>
    writeAudit(tx, { organisationId: current.organisation.id, actor: current.user, action: "auth.signature.sso-refused", entityType: "case", entityId: caseId, after }),
  );
}

/**
 * Completes a signature after the identity provider's answer (already checked by readSsoCallback):
 * the request must be this person's, from this session, unused and unexpired; the ID token's nonce
 * must be the request's; its subject the person's linked one; and its auth_time no older than the
 * request (the provider authenticated them again for this signature). Then the signature is made
 * on exactly what the request fixed. Every refusal is audited. Returns where to go and what to say.
 */
export async function completeSsoSignature(current: CurrentUser, flow: SsoFlow & { kind: "signature" }, identity: SsoIdentity): Promise<{ page: string; outcome: SignatureOutcome }> {
  const now = new Date();
  // Single use: taken in the same statement that checks it is this person's, this session's and still open.
  const [req] = await db
    .update(signingRequests)
    .set({ completedAt: now })
    .where(and(eq(signingRequests.id, flow.requestId), eq(signingRequests.userId, current.user.id), eq(signingRequests.sessionId, current.sessionId), isNull(signingRequests.completedAt), gt(signingRequests.expiresAt, now)))
    .returning();
  if (!req) return { page: "/checks", outcome: "expired" };
  const request: SignatureRequest =
    req.intent === "approve" || req.intent === "submit"
      ? { intent: req.intent, caseId: req.caseId, step: req.step!, comment: req.comment }
      : req.intent === "approve-case"
        ? { intent: "approve-case", caseId: req.caseId }
        : { intent: "release", caseId: req.caseId, reportId: req.reportId! };
  const kind = kindOf(request);
  const page = signingPage(request);
  const refuse = async (outcome: SignatureOutcome, reason: string) => {
    await auditRefusal(current, req.caseId, { what: kind.what(request), reason });
    return { page, outcome };
  };
  const [user] = await db.select({ sub: users.ssoSubject }).from(users).where(eq(users.id, current.user.id));
  if (sha256Hex(flow.nonce) !== req.nonceHash) return refuse("mismatch", "the identity token's nonce is not the request's");
  if (!user?.sub || identity.sub !== user.sub || identity.email !== current.user.email.toLowerCase()) return refuse("mismatch", "the identity provider vouched for someone else");
  const requestedAt = Math.floor(req.createdAt.getTime() / 1000);
  if (identity.authTime === null || identity.authTime < requestedAt - AUTH_TIME_SKEW_S || identity.authTime > Math.floor(now.getTime() / 1000) + AUTH_TIME_SKEW_S) {
    return refuse("not-fresh", `the identity provider did not authenticate the person afresh (auth_time ${identity.authTime ?? "missing"}, request at ${requestedAt})`);
  }
  try {
    await kind.sign(current, request, { confirmedBy: "sso", expectedHash: req.targetHash });
  } catch (error) {
    if (!(error instanceof DomainError)) throw error;
    return refuse(error.kind === "forbidden" ? "forbidden" : error.field === "revision" || /changed since/.test(error.message) ? "changed" : "refused", error.message);
  }
  return { page, outcome: "signed" };
}

/**
 * A signature through the identity provider whose round trip failed (refused, expired, a bad
 * token): the request is used up and the refusal audited, so it cannot be completed later.
 */
export async function abandonSsoSignature(current: CurrentUser, flow: SsoFlow & { kind: "signature" }, reason: string): Promise<{ page: string; outcome: SignatureOutcome }> {
  const [req] = await db
    .update(signingRequests)
    .set({ completedAt: new Date() })
    .where(and(eq(signingRequests.id, flow.requestId), eq(signingRequests.userId, current.user.id), isNull(signingRequests.completedAt)))
    .returning();
  if (!req) return { page: "/checks", outcome: "expired" };
  await auditRefusal(current, req.caseId, { reason: `company sign-in did not complete (${reason})` });
  return { page: href(`/cases/:caseId/${KINDS[req.intent].page}`, { caseId: req.caseId }), outcome: "failed" };
}
