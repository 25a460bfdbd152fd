import { relations, sql } from "drizzle-orm";
import {
  bigint,
  bigserial,
  boolean,
  check,
  customType,
  index,
  integer,
  jsonb,
  pgTable,
  primaryKey,
  text,
  timestamp,
  unique,
  uniqueIndex,
  uuid,
} from "drizzle-orm/pg-core";
import type { AnalysisJobStatus, ApiTokenScope, CaseStatus, CommentKind, CredentialPurpose, ReportStatus, Role, SignatureMeaning, SignInMethod, StepKey, StepStatus } from "~/domain/vocabulary";

const createdAt = () => timestamp("created_at", { withTimezone: true }).defaultNow().notNull();

export const organisations = pgTable("organisations", {
  id: uuid().primaryKey().defaultRandom(),
  name: text().notNull(),
  slug: text().notNull().unique(),
  createdAt: createdAt(),
});

export const users = pgTable(
  "users",
  {
    id: uuid().primaryKey().defaultRandom(),
    /** Stored lower-case; compared lower-case. */
    email: text().notNull(),
    name: text().notNull(),
    /** argon2id PHC string; null for accounts that only use company sign-in. */
    passwordHash: text("password_hash"),
    /** Subject at the company identity provider once linked. */
    ssoSubject: text("sso_subject"),
    disabled: boolean().default(false).notNull(),
    createdAt: createdAt(),
    lastSignInAt: timestamp("last_sign_in_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("users_email_key").on(t.email), uniqueIndex("users_sso_subject_key").on(t.ssoSubject)],
);

export const memberships = pgTable(
  "memberships",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    roles: text().array().$type<Role[]>().notNull().default(sql`'{}'::text[]`),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("memberships_user_org_key").on(t.userId, t.organisationId)],
);

export const sessions = pgTable(
  "sessions",
  {
    id: uuid().primaryKey().defaultRandom(),
    /** SHA-256 (hex) of the random token in the cookie; the token itself is never stored. */
    tokenHash: text("token_hash").notNull(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    method: text().$type<SignInMethod>().notNull(),
    createdAt: createdAt(),
    lastSeenAt: timestamp("last_seen_at", { withTimezone: true }).defaultNow().notNull(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    userAgent: text("user_agent"),
  },
  (t) => [uniqueIndex("sessions_token_hash_key").on(t.tokenHash), index("sessions_user_idx").on(t.userId)],
);

/**
 * Every attempt to prove identity with a password, kept for throttling per account (and, for
 * sign-in, per client address). `device` marks an attempt from a browser that signed in to this
 * account successfully before (a known device), which the account's throttle does not hold back.
 */
export const signInAttempts = pgTable(
  "sign_in_attempts",
  {
    id: bigserial({ mode: "number" }).primaryKey(),
    purpose: text().$type<CredentialPurpose>().default("sign-in").notNull(),
    email: text().notNull(),
    address: text().notNull(),
    device: boolean().default(false).notNull(),
    succeeded: boolean().notNull(),
    at: timestamp({ withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("sign_in_attempts_email_idx").on(t.email, t.at), index("sign_in_attempts_address_idx").on(t.address, t.at)],
);

/**
 * Browsers that have signed in to an account with its password: the device cookie holds a random
 * token, only its SHA-256 is kept. A stranger guessing passwords cannot slow these browsers down.
 */
export const knownDevices = pgTable(
  "known_devices",
  {
    tokenHash: text("token_hash").notNull(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    createdAt: createdAt(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.tokenHash, t.userId] }), index("known_devices_user_idx").on(t.userId)],
);

export const invitations = pgTable(
  "invitations",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    email: text().notNull(),
    roles: text().array().$type<Role[]>().notNull(),
    tokenHash: text("token_hash").notNull(),
    invitedBy: uuid("invited_by").notNull().references(() => users.id),
    createdAt: createdAt(),
    expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
    acceptedAt: timestamp("accepted_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("invitations_token_hash_key").on(t.tokenHash)],
);

/** An aircraft type programme: the certification project a set of cases belongs to. */
export const programmes = pgTable(
  "programmes",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    code: text().notNull(),
    name: text().notNull(),
    aircraft: text().notNull(),
    description: text().default("").notNull(),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("programmes_org_code_key").on(t.organisationId, t.code)],
);

/** A loads case file: the wing-loads part of a certification case. */
export const cases = pgTable(
  "cases",
  {
    id: uuid().primaryKey().defaultRandom(),
    programmeId: uuid("programme_id").notNull().references(() => programmes.id, { onDelete: "cascade" }),
    /** Copied from the programme so every query can filter by organisation directly. */
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    reference: text().notNull(),
    title: text().notNull(),
    description: text().default("").notNull(),
    status: text().$type<CaseStatus>().default("draft").notNull(),
    revision: integer().default(1).notNull(),
    createdBy: uuid("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [uniqueIndex("cases_programme_reference_key").on(t.programmeId, t.reference), index("cases_org_idx").on(t.organisationId)],
);

/**
 * Append-only audit trail, written in the same transaction as the change it records. Each
 * organisation has its own chain (entries without one form the system chain): `seq` counts its
 * entries from 1, and each entry's hash covers its id, chain, sequence, content and the hash of the
 * entry before, so any edit, insertion or deletion breaks the chain visibly. The chain's head is
 * also anchored outside the database (app/db/audit-anchors.server.ts).
 */
export const auditLog = pgTable(
  "audit_log",
  {
    id: bigserial({ mode: "number" }).primaryKey(),
    seq: bigint({ mode: "number" }).notNull(),
    at: timestamp({ withTimezone: true }).defaultNow().notNull(),
    organisationId: uuid("organisation_id").references(() => organisations.id, { onDelete: "set null" }),
    actorId: uuid("actor_id").references(() => users.id, { onDelete: "set null" }),
    actorEmail: text("actor_email"),
    action: text().notNull(),
    entityType: text("entity_type").notNull(),
    entityId: text("entity_id"),
    before: jsonb(),
    after: jsonb(),
    prevHash: text("prev_hash").notNull(),
    hash: text().notNull(),
  },
  (t) => [
    index("audit_log_org_idx").on(t.organisationId, t.id),
    index("audit_log_entity_idx").on(t.entityType, t.entityId),
    unique("audit_log_chain_seq_key").on(t.organisationId, t.seq).nullsNotDistinct(),
  ],
);

/**
 * The current state of each step of a case. `revision` grows by one with every save and is the
 * optimistic-concurrency token: a save names the revision it started from and is refused if another
 * save came first.
 */
/** Load cases kept in case_steps.head (the `[0 to 99]` of its expression). */
export const STEP_HEAD_CASES = 100;

export const caseSteps = pgTable(
  "case_steps",
  {
    id: uuid().primaryKey().defaultRandom(),
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    step: text().$type<StepKey>().notNull(),
    revision: integer().default(0).notNull(),
    status: text().$type<StepStatus>().default("empty").notNull(),
    data: jsonb().$type<Record<string, unknown>>(),
    updatedBy: uuid("updated_by").references(() => users.id),
    updatedAt: timestamp("updated_at", { withTimezone: true }).defaultNow().notNull(),
    // Kept by PostgreSQL whenever data is written (by any writer), so that reading them never reads
    // the data: an envelope of 100 000 load cases is 13 MB of JSON, and hashing or counting it costs
    // hundreds of milliseconds per request.
    /** MD5 of the data's normalised jsonb text: equal data, equal digest (getCaseStepsDigest). */
    dataDigest: text("data_digest").generatedAlwaysAs(sql`md5(data::text)`),
    /** How many load cases the data hold (the envelope's `cases`), else null. */
    caseCount: integer("case_count").generatedAlwaysAs(sql`case when jsonb_typeof(data -> 'cases') = 'array' then jsonb_array_length(data -> 'cases') end`),
    /** The data with only their first STEP_HEAD_CASES load cases (the envelope's first rows), else null. */
    head: jsonb()
      .$type<Record<string, unknown>>()
      .generatedAlwaysAs(sql`case when jsonb_typeof(data -> 'cases') = 'array' then jsonb_set(data, '{cases}', jsonb_path_query_array(data, '$.cases[0 to 99]')) end`),
  },
  (t) => [uniqueIndex("case_steps_case_step_key").on(t.caseId, t.step)],
);

/** Every saved revision of every step, kept whole, with the SHA-256 of its canonical JSON. */
export const stepRevisions = pgTable(
  "step_revisions",
  {
    id: bigserial({ mode: "number" }).primaryKey(),
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    step: text().$type<StepKey>().notNull(),
    revision: integer().notNull(),
    data: jsonb().$type<Record<string, unknown>>().notNull(),
    hash: text().notNull(),
    createdBy: uuid("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [uniqueIndex("step_revisions_case_step_rev_key").on(t.caseId, t.step, t.revision)],
);

/** Bytes as PostgreSQL's bytea (the pg client gives and takes Buffers). */
const bytea = customType<{ data: Buffer; driverData: Buffer }>({ dataType: () => "bytea" });

/** Engine results of a case, keyed by the hash of the exchange-format input they were computed from. */
export const caseResults = pgTable(
  "case_results",
  {
    id: uuid().primaryKey().defaultRandom(),
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    inputHash: text("input_hash").notNull(),
    engineVersion: text("engine_version").notNull(),
    input: jsonb().$type<Record<string, unknown>>().notNull(),
    result: jsonb().$type<Record<string, unknown>>().notNull(),
    /** What pages read of the result without reading it (ResultSummary: method, first case, flagged cases counted by reason; their rows are in result_flags). Null, or an older form holding the flagged cases inline, for results stored before: made again on first read. */
    summary: jsonb().$type<Record<string, unknown>>(),
    /**
     * The result document as the API sends it (`spanwright.result/1`, UTF-8 JSON), brotli-compressed
     * once when the result is stored, so no web process serialises and compresses it again. Null for
     * results stored before it was kept.
     */
    documentBr: bytea("document_br"),
    /** The loads page's ranked root loads, envelope and critical case (rankedRootLoads), kept as the result is stored; null for results stored before it was kept. */
    rootLoads: jsonb("root_loads").$type<Record<string, unknown>>(),
    /**
     * The input without its load cases (`head`) and its sections document (`sections`, or null), kept
     * as the result is stored: with the rows of result_cases, a page's few cases without the input.
     * Null for results stored before it was kept (they have no rows in result_cases either).
     */
    inputHead: jsonb("input_head").$type<Record<string, unknown>>(),
    computedBy: uuid("computed_by").references(() => users.id),
    computedAt: timestamp("computed_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("case_results_case_idx").on(t.caseId, t.computedAt)],
);

/**
 * Each load case of a stored result: its entry in the input (with its place there) and in the result,
 * copied by PostgreSQL out of the stored row as the result is stored. A page that shows one case of
 * 100 000 reads it by key instead of PostgreSQL taking the stored input and result (megabytes each)
 * apart on every request. Goes with its result.
 */
export const resultCases = pgTable(
  "result_cases",
  {
    resultId: uuid("result_id").notNull().references(() => caseResults.id, { onDelete: "cascade" }),
    loadCase: text("load_case").notNull(),
    ordinal: integer().notNull(),
    input: jsonb().$type<Record<string, unknown>>().notNull(),
    result: jsonb().$type<Record<string, unknown>>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.resultId, t.loadCase] })],
);

/**
 * Each flagged case of a stored result (above the critical Mach number, over clmax, or with an
 * unreliable critical Mach number), in the result's order, with the facts of its flag: the
 * distribution page reads the rows it shows and counts the open ones here, instead of taking every
 * flagged case of a 100 000-case result out of one document. Written with its result; goes with it.
 */
export const resultFlags = pgTable(
  "result_flags",
  {
    resultId: uuid("result_id").notNull().references(() => caseResults.id, { onDelete: "cascade" }),
    /** Place among the result's flagged cases, from 0: a page's range of rows is a range of ranks. */
    rank: integer().notNull(),
    loadCase: text("load_case").notNull(),
    /** The reasons (FlagReason), in FLAG_REASONS order. */
    kinds: text().array().notNull(),
    /** The flag's facts (FlagFacts). */
    facts: jsonb().$type<Record<string, unknown>>().notNull(),
  },
  (t) => [primaryKey({ columns: [t.resultId, t.rank] }), uniqueIndex("result_flags_case_idx").on(t.resultId, t.loadCase)],
);

/**
 * Which exchange input a case's steps make: the SHA-256 that names its results, against a digest of
 * the steps it was built from (and the title, the scope and the engine version that build it), so a
 * web process finds the stored result with one indexed read instead of building and checking the
 * whole case file. A save to any step it reads changes the digest, so a row is never stale.
 */
export const resultInputs = pgTable(
  "result_inputs",
  {
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    /** SHA-256 of scope, title and the steps' digest (getCaseStepsDigest). */
    source: text().notNull(),
    engineVersion: text("engine_version").notNull(),
    inputHash: text("input_hash").notNull(),
    /** Load cases in the input: what a page says while the result is computed. */
    caseCount: integer("case_count").notNull(),
    createdAt: timestamp("created_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.caseId, t.source, t.engineVersion] })],
);

/**
 * How far the job worker has got with a large sweep (results.compute): one row per case input and engine
 * version, written as the engine reports its progress, so every web process can show it while the
 * result is not stored yet.
 */
export const resultProgress = pgTable(
  "result_progress",
  {
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    inputHash: text("input_hash").notNull(),
    engineVersion: text("engine_version").notNull(),
    /** queued: waiting for a worker; solving: spanwise solves; cases: evaluating the cases; done: stored; failed: the engine refused it. */
    phase: text().$type<"queued" | "solving" | "cases" | "done" | "failed">().default("queued").notNull(),
    solves: integer().default(0).notNull(),
    casesDone: integer("cases_done").default(0).notNull(),
    casesTotal: integer("cases_total").notNull(),
    /** Why the engine refused it, in its words (phase failed): said on the page instead of waiting for ever. */
    problem: text(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.caseId, t.inputHash, t.engineVersion] })],
);

/**
 * The distribution page's rule sensitivity (the critical cases' root loads under each compressibility
 * rule), computed by the job worker (sensitivity.compute) for one input of the distribution step and
 * engine version, with its progress while it runs; the page reads it, never solves it.
 */
export const ruleSensitivities = pgTable(
  "rule_sensitivities",
  {
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    inputHash: text("input_hash").notNull(),
    engineVersion: text("engine_version").notNull(),
    /** queued: waiting for a worker; results: the case's own sweep; solving: the rules; done; failed (the engine refused it). */
    phase: text().$type<"queued" | "results" | "solving" | "done" | "failed">().default("queued").notNull(),
    /** Critical cases solved under each rule so far, of all (cases × rules). */
    done: integer().default(0).notNull(),
    total: integer().default(0).notNull(),
    sensitivity: jsonb().$type<Record<string, unknown>>(),
    /** Why the engine refused it, in its words (phase failed). */
    problem: text(),
    updatedAt: timestamp("updated_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [primaryKey({ columns: [t.caseId, t.inputHash, t.engineVersion] })],
);

/** Files received from people (section-data CSV), stored whole in S3 with their SHA-256. */
export const uploads = pgTable(
  "uploads",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    bucket: text().notNull(),
    key: text().notNull(),
    filename: text().notNull(),
    contentType: text("content_type").notNull(),
    size: integer().notNull(),
    sha256: text().notNull(),
    createdBy: uuid("created_by").notNull().references(() => users.id),
    createdAt: createdAt(),
  },
  (t) => [index("uploads_case_idx").on(t.caseId)],
);

/** Personal API tokens: shown once at creation, only the SHA-256 kept. */
export const apiTokens = pgTable(
  "api_tokens",
  {
    id: uuid().primaryKey().defaultRandom(),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    name: text().notNull(),
    tokenHash: text("token_hash").notNull(),
    /** The first characters, so a person can tell their tokens apart. */
    prefix: text().notNull(),
    /** "read" tokens only read; "read-write" tokens may also change records (import). */
    scope: text().$type<ApiTokenScope>().default("read-write").notNull(),
    createdAt: createdAt(),
    lastUsedAt: timestamp("last_used_at", { withTimezone: true }),
    revokedAt: timestamp("revoked_at", { withTimezone: true }),
  },
  (t) => [uniqueIndex("api_tokens_token_hash_key").on(t.tokenHash), index("api_tokens_user_idx").on(t.userId)],
);

/**
 * Electronic signatures, append-only: who signed, in which role, what the signature means, when
 * (UTC), and the SHA-256 of the canonical serialisation of exactly what was signed. A signature is
 * never changed or deleted; a later edit appends a row to `signature_voids` instead.
 */
export const signatures = pgTable(
  "signatures",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id),
    caseId: uuid("case_id").notNull().references(() => cases.id),
    /** A step signature names the step and its revision; a report signature names the report. */
    step: text().$type<StepKey>(),
    revision: integer(),
    reportId: uuid("report_id"),
    signerId: uuid("signer_id").notNull().references(() => users.id),
    signerName: text("signer_name").notNull(),
    role: text().$type<Role>().notNull(),
    meaning: text().$type<SignatureMeaning>().notNull(),
    /** How the signer re-confirmed their identity: password, or a fresh company sign-in. */
    confirmedBy: text("confirmed_by").$type<SignInMethod>().notNull(),
    revisionHash: text("revision_hash").notNull(),
    signedAt: timestamp("signed_at", { withTimezone: true }).defaultNow().notNull(),
  },
  (t) => [index("signatures_case_idx").on(t.caseId, t.step), index("signatures_report_idx").on(t.reportId)],
);

/** Voiding of a signature by a later change, appended (signatures themselves never change). */
export const signatureVoids = pgTable("signature_voids", {
  id: uuid().primaryKey().defaultRandom(),
  signatureId: uuid("signature_id").notNull().unique().references(() => signatures.id),
  reason: text().notNull(),
  voidedBy: uuid("voided_by").references(() => users.id),
  voidedAt: timestamp("voided_at", { withTimezone: true }).defaultNow().notNull(),
});

/** The review thread of a step: comments of checkers and engineers, optionally pointing at a field or row. */
export const stepComments = pgTable(
  "step_comments",
  {
    id: uuid().primaryKey().defaultRandom(),
    caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
    step: text().$type<StepKey>().notNull(),
    revision: integer().notNull(),
    authorId: uuid("author_id").notNull().references(() => users.id),
    kind: text().$type<CommentKind>().notNull(),
    /** What the comment points at, e.g. "stations row 3" or "VD". */
    anchor: text(),
    body: text().notNull(),
    createdAt: createdAt(),
  },
  (t) => [index("step_comments_case_step_idx").on(t.caseId, t.step, t.createdAt)],
);

/**
 * Issued reports: one row per version of a case's report. The PDF bytes live in S3 under `key`;
 * the row records their size and SHA-256, the engine version and the input snapshot they came from.
 * A row reaches "issued" only in the same transaction that records the stored object.
 */
export const reports = pgTable(
  "reports",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id),
    caseId: uuid("case_id").notNull().references(() => cases.id),
    version: integer().notNull(),
    reportNumber: text("report_number").notNull(),
    status: text().$type<ReportStatus>().default("queued").notNull(),
    progress: integer().default(0).notNull(),
    progressNote: text("progress_note").default("").notNull(),
    attempts: integer().default(0).notNull(),
    failure: text(),
    requestedBy: uuid("requested_by").notNull().references(() => users.id),
    requestedAt: timestamp("requested_at", { withTimezone: true }).defaultNow().notNull(),
    bucket: text(),
    key: text(),
    size: integer(),
    sha256: text(),
    inputHash: text("input_hash"),
    engineVersion: text("engine_version"),
    snapshot: jsonb().$type<Record<string, unknown>>(),
    issuedAt: timestamp("issued_at", { withTimezone: true }),
    releasedAt: timestamp("released_at", { withTimezone: true }),
  },
  (t) => [
    uniqueIndex("reports_case_version_key").on(t.caseId, t.version),
    index("reports_sha_idx").on(t.sha256),
    // An issued or released report always names its stored object; a released one its release time.
    // (Once issued, a row only takes its release: the reports_append_only trigger refuses the rest.)
    check("reports_issued_has_object", sql`${t.status} NOT IN ('issued', 'released') OR (${t.key} IS NOT NULL AND ${t.sha256} IS NOT NULL AND ${t.size} IS NOT NULL AND ${t.issuedAt} IS NOT NULL)`),
    check("reports_released_has_time", sql`${t.status} <> 'released' OR ${t.releasedAt} IS NOT NULL`),
  ],
);

/**
 * A re-run of an issued report: its stored input snapshot recomputed with the engine of the day (a
 * job), and every number compared with the issued one. The recomputed numbers are kept, so the
 * comparison can be checked again.
 */
export const reportReruns = pgTable(
  "report_reruns",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    reportId: uuid("report_id").notNull().references(() => reports.id, { onDelete: "cascade" }),
    requestedBy: uuid("requested_by").notNull().references(() => users.id),
    status: text().$type<AnalysisJobStatus>().default("queued").notNull(),
    progress: integer().default(0).notNull(),
    progressNote: text("progress_note").default("").notNull(),
    /** Engine that recomputed the numbers (the report's own is on the report). */
    engineVersion: text("engine_version"),
    identical: boolean(),
    compared: integer(),
    differing: integer(),
    /** The first differences found, in document order. */
    differences: jsonb().$type<{ path: string; issued: string; now: string }[]>(),
    result: jsonb().$type<Record<string, unknown>>(),
    failure: text(),
    createdAt: createdAt(),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (t) => [index("report_reruns_report_idx").on(t.reportId, t.createdAt)],
);

/**
 * A signature waiting for its company sign-in: created when a person who signs with the identity
 * provider asks to sign, completed once, within ten minutes, by an ID token that proves a fresh
 * authentication (auth_time after this row was made) for this very request (its nonce). What is
 * signed is fixed here: if the step, case or report changed meanwhile, the signature is refused.
 */
export const signingRequests = pgTable("signing_requests", {
  id: uuid().primaryKey().defaultRandom(),
  userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
  sessionId: uuid("session_id").notNull().references(() => sessions.id, { onDelete: "cascade" }),
  organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
  caseId: uuid("case_id").notNull().references(() => cases.id, { onDelete: "cascade" }),
  intent: text().$type<"submit" | "approve" | "approve-case" | "release">().notNull(),
  step: text().$type<StepKey>(),
  reportId: uuid("report_id"),
  comment: text().default("").notNull(),
  /** The hash of what will be signed, as it stood when the person asked to sign. */
  targetHash: text("target_hash").notNull(),
  /** SHA-256 of the nonce sent to the identity provider. */
  nonceHash: text("nonce_hash").notNull(),
  createdAt: createdAt(),
  expiresAt: timestamp("expires_at", { withTimezone: true }).notNull(),
  completedAt: timestamp("completed_at", { withTimezone: true }),
});

/**
 * An analysis of `POST /api/v1/analyze` too large to answer within the request: solved by a
 * worker, polled by its id, kept for a day. `input` is the document as sent; `result` the
 * `spanwright.result/1` answer, or `problems` when the engine refused the input.
 */
export const analysisJobs = pgTable(
  "analysis_jobs",
  {
    id: uuid().primaryKey().defaultRandom(),
    organisationId: uuid("organisation_id").notNull().references(() => organisations.id, { onDelete: "cascade" }),
    userId: uuid("user_id").notNull().references(() => users.id, { onDelete: "cascade" }),
    status: text().$type<AnalysisJobStatus>().default("queued").notNull(),
    cases: integer().notNull(),
    input: jsonb().$type<Record<string, unknown>>().notNull(),
    result: jsonb().$type<Record<string, unknown>>(),
    problems: jsonb().$type<{ path: string; message: string }[]>(),
    createdAt: createdAt(),
    finishedAt: timestamp("finished_at", { withTimezone: true }),
  },
  (t) => [index("analysis_jobs_user_idx").on(t.userId, t.createdAt)],
);

export const usersRelations = relations(users, ({ many }) => ({ memberships: many(memberships) }));
export const membershipsRelations = relations(memberships, ({ one }) => ({
  user: one(users, { fields: [memberships.userId], references: [users.id] }),
  organisation: one(organisations, { fields: [memberships.organisationId], references: [organisations.id] }),
}));
export const programmesRelations = relations(programmes, ({ one, many }) => ({
  organisation: one(organisations, { fields: [programmes.organisationId], references: [organisations.id] }),
  cases: many(cases),
}));
export const casesRelations = relations(cases, ({ one }) => ({
  programme: one(programmes, { fields: [cases.programmeId], references: [programmes.id] }),
  creator: one(users, { fields: [cases.createdBy], references: [users.id] }),
}));

export type User = typeof users.$inferSelect;
export type Organisation = typeof organisations.$inferSelect;
export type Programme = typeof programmes.$inferSelect;
export type Case = typeof cases.$inferSelect;
export type AuditEntry = typeof auditLog.$inferSelect;
export type CaseStep = typeof caseSteps.$inferSelect;
export type StepRevision = typeof stepRevisions.$inferSelect;
export type CaseResultRow = typeof caseResults.$inferSelect;
export type Upload = typeof uploads.$inferSelect;
export type Signature = typeof signatures.$inferSelect;
export type Report = typeof reports.$inferSelect;
export type StepComment = typeof stepComments.$inferSelect;
