/**
 * The words of the product, defined once: the database schema types its columns with them, the
 * services check against them and the pages show their labels. Isomorphic (no server imports), so
 * the browser gets these lists without the database schema.
 */

/** Roles a member holds in an organisation; what each may do is in ./permissions. */
export const ROLES = ["engineer", "checker", "quality", "admin"] as const;
export type Role = (typeof ROLES)[number];

/** The steps of a case, in working order (labels in ./steps). */
export const STEP_KEYS = ["basis", "planform", "sections", "masses", "envelope", "distribution", "loads"] as const;
export type StepKey = (typeof STEP_KEYS)[number];

export const STEP_STATUSES = ["empty", "draft", "submitted", "returned", "approved"] as const;
export type StepStatus = (typeof STEP_STATUSES)[number];

/** Each status has its word and an icon shape, so it never rests on colour alone. */
export const STEP_STATUS_LABELS: Record<StepStatus, { label: string; icon: string }> = {
  empty: { label: "Not started", icon: "·" },
  draft: { label: "Draft", icon: "○" },
  submitted: { label: "Submitted", icon: "◔" },
  returned: { label: "Returned", icon: "↺" },
  approved: { label: "Approved", icon: "✓" },
};

export const CASE_STATUSES = ["draft", "submitted", "returned", "approved", "issued", "released"] as const;
export type CaseStatus = (typeof CASE_STATUSES)[number];

export const CASE_STATUS_LABELS: Record<CaseStatus, { label: string; icon: string }> = {
  draft: { label: "Draft", icon: "○" },
  submitted: { label: "Submitted", icon: "◔" },
  returned: { label: "Returned", icon: "↺" },
  approved: { label: "Approved", icon: "✓" },
  issued: { label: "Issued", icon: "■" },
  released: { label: "Released", icon: "★" },
};

/** What a signature means: a step prepared (signed by the engineer who submits it), a checked step, a case approved for issue, a released report. */
export const SIGNATURE_MEANINGS = ["prepared", "checked", "approved for issue", "released"] as const;
export type SignatureMeaning = (typeof SIGNATURE_MEANINGS)[number];

/** How a person proved who they are: at sign-in, and again when signing. */
export const SIGN_IN_METHODS = ["password", "sso"] as const;
export type SignInMethod = (typeof SIGN_IN_METHODS)[number];

/** Entries of a step's review thread. */
export const COMMENT_KINDS = ["comment", "submitted", "returned", "approved"] as const;
export type CommentKind = (typeof COMMENT_KINDS)[number];

export const REPORT_STATUSES = ["queued", "generating", "issued", "released", "failed"] as const;
export type ReportStatus = (typeof REPORT_STATUSES)[number];
/** A report in these states is still being made: no second one may be requested. */
export const PENDING_REPORT_STATUSES = ["queued", "generating"] as const satisfies readonly ReportStatus[];

/**
 * What is happening to a report, in the words the reports page shows beside its bar: queued (no
 * worker has taken it yet), rendering (the PDF is being drawn), storing (the PDF goes to storage
 * and its record is written), issued, or failed. The job's progress notes name the stage they are in.
 */
export function reportStage(status: ReportStatus, note: string): "Queued" | "Rendering" | "Storing" | "Issued" | "Failed" {
  if (status === "queued") return "Queued";
  if (status === "failed") return "Failed";
  if (status === "issued" || status === "released") return "Issued";
  return note.startsWith("storing") ? "Storing" : "Rendering";
}
/** A report in these states exists as a stored PDF. */
export const ISSUED_REPORT_STATUSES = ["issued", "released"] as const satisfies readonly ReportStatus[];

/** What a password was given for: signing in, signing a record, joining by invitation, changing it. */
export const CREDENTIAL_PURPOSES = ["sign-in", "signature", "invitation", "password-change"] as const;
export type CredentialPurpose = (typeof CREDENTIAL_PURPOSES)[number];

/** What a personal API token may do: only read, or also change records. */
export const API_TOKEN_SCOPES = ["read", "read-write"] as const;
export type ApiTokenScope = (typeof API_TOKEN_SCOPES)[number];

/** A queued analysis of the API: waiting, being solved, answered, or refused by the engine. */
export const ANALYSIS_JOB_STATUSES = ["queued", "running", "done", "failed"] as const;
export type AnalysisJobStatus = (typeof ANALYSIS_JOB_STATUSES)[number];

/**
 * The compressibility rules and spanwise solvers a case file may use, and their names on pages and in
 * the report. Here, not beside the step schemas: a page that only names them does not load zod.
 */
export const COMPRESSIBILITY_RULES = ["prandtl-glauert", "karman-tsien", "laitone"] as const;
export const SPANWISE_METHODS = ["vortex-lattice", "lifting-line"] as const;
export const RULE_LABELS: Record<(typeof COMPRESSIBILITY_RULES)[number], string> = {
  "prandtl-glauert": "Prandtl–Glauert (Göthert for the wing)",
  "karman-tsien": "Kármán–Tsien",
  laitone: "Laitone",
};
export const SPANWISE_LABELS: Record<(typeof SPANWISE_METHODS)[number], string> = {
  "vortex-lattice": "Vortex lattice",
  "lifting-line": "Lifting line (quarter-chord sweep up to 15°)",
};

/** The certification categories a basis may name (the zod schemas of the steps take them from here). */
export const CATEGORIES = ["part25", "part23-normal", "part23-utility", "part23-acrobatic", "part23-commuter"] as const;
export type Category = (typeof CATEGORIES)[number];

export const CATEGORY_LABELS: Record<Category, string> = {
  part25: "Transport category aeroplane (14 CFR Part 25 / CS-25)",
  "part23-normal": "Normal category small aeroplane (14 CFR Part 23 before amendment 23-64 / CS-23)",
  "part23-utility": "Utility category small aeroplane (14 CFR Part 23 / CS-23)",
  "part23-acrobatic": "Acrobatic category small aeroplane (14 CFR Part 23 / CS-23)",
  "part23-commuter": "Commuter category aeroplane (14 CFR Part 23 / CS-23)",
};

/** The regulation references a basis starts with; the engineer edits them to the agreed basis. */
export const DEFAULT_REGULATIONS: Record<Category, string> = {
  part25: "14 CFR 25.301, 25.303, 25.321, 25.333, 25.335, 25.337, 25.341(a)",
  "part23-normal": "14 CFR 23.301, 23.303, 23.321, 23.333, 23.335, 23.337, 23.341",
  "part23-utility": "14 CFR 23.301, 23.303, 23.321, 23.333, 23.335, 23.337, 23.341",
  "part23-acrobatic": "14 CFR 23.301, 23.303, 23.321, 23.333, 23.335, 23.337, 23.341",
  "part23-commuter": "14 CFR 23.301, 23.303, 23.321, 23.333, 23.335, 23.337, 23.341",
};
