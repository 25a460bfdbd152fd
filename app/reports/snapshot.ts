import type { BasisData, DistributionData, EnvelopeData, LoadsData, MassesData, PlanformData, SectionsData } from "~/domain/step-data";
import type { DistributionSeries } from "~/charts/distribution";
import type { CompressibilityRule, TunedGustResult, VnPoint, WingGeometry } from "~/engine";
import type { CaseFileInput, CaseResult } from "~/exchange";
import type { RuleSensitivity, SpanwiseComparison } from "~/domain/comparisons";
import type { ReportComparison } from "~/domain/report-comparison";

/** One signature as it appears on the report's signature page and in the API. */
export interface SignatureLine {
  step: string | null;
  name: string;
  role: string;
  meaning: string;
  signedAt: string;
  revision: number | null;
  revisionHash: string;
}

/**
 * Everything a report is made from, frozen when it is issued and stored with it, so the PDF can be
 * regenerated and compared, and "what changed" between versions can be shown. Plain JSON.
 */
export interface ReportSnapshot {
  reportId: string;
  reportNumber: string;
  version: number;
  issuedAt: string;
  organisation: string;
  programme: { code: string; name: string; aircraft: string };
  case: { id: string; reference: string; title: string; description: string };
  /** Step revisions the report is built from. */
  revisions: Record<string, number>;
  inputHash: string;
  engineVersion: string;
  inputs: {
    basis: BasisData;
    planform: PlanformData;
    sections: SectionsData;
    envelope: EnvelopeData;
    distribution: DistributionData;
    loads: LoadsData;
    /** The masses the case was analysed with (absent in reports issued before the masses step existed). */
    masses?: MassesData | null;
  };
  /** The exchange document the results were computed from, and the results (spanwright.result/1). */
  exchange: CaseFileInput;
  result: CaseResult;
  /**
   * The documents attached to the PDF, as their exact text: the case as `spanwright.case/1` (the bytes
   * the export gives for the unchanged case) and, where the case has them, its richer section data as
   * `spanwright.sections/1`. Snapshots made before reports carried attachments have none: their
   * documents are serialised from `exchange` when they are rendered.
   */
  documents?: { case: string; sections?: string };
  /**
   * Beyond the results, computed from the exchange document when the report is issued and frozen
   * with it (absent from reports issued before): the critical cases' root loads under each of the
   * three compressibility rules, and the critical cases by each spanwise method where it is valid.
   */
  sensitivity?: RuleSensitivity;
  spanwise?: SpanwiseComparison[];
  /**
   * What changed from the previous issued version of the report (inputs field by field, root loads,
   * the envelope at each station), computed from both snapshots at issue; absent from a first version
   * and from reports issued before comparisons were part of the report.
   */
  comparison?: ReportComparison;
  /** Flagged cases with their dispositions. */
  flags: { id: string; reasons: string[]; action: string; comment: string }[];
  signatures: SignatureLine[];
}

/** One V–n diagram: a design weight at an altitude, its corner and gust points and the gust data. */
export interface VnFigure {
  label: string;
  weightKg: number;
  points: VnPoint[];
  /** Airplane lift slope used in the gust formula, per rad. */
  liftSlope: number;
  gustAtVc: number;
  gustAtVd: number;
  gustRule: string;
  /** The flaps-extended conditions at V_F, where the basis gives V_F: speed, CLmax with flaps, lift slope of the flapped wing. */
  flaps?: { vf: number; clMax: number; liftSlope: number };
}

/** The spanwise distributions of one case, solved under the case's rule and under each of the three. */
export type DistributionFigure = Omit<DistributionSeries, "rules"> & {
  caseId: string;
  altitude: number;
  rule: CompressibilityRule;
  CL: number;
  alphaDeg: number;
  regime: string;
  machCritical: number | null;
  rules: (DistributionSeries["rules"][number] & { CL: number; clAlpha: number; machCritical: number | null })[];
};

/** Each mass case with what it puts on the wing and its checks against the basis, and the balance of every trimmed case. */
export interface MassesFigure {
  cases: { id: string; label: string; weight: number | null; cg: number | null; itemsKg: number; wingKg: number; itemsX: number | null; checks: { ok: boolean; text: string }[] }[];
  /** Tail load and wing lift (N) of each trimmed case, and where the tail load came from. */
  balance: { caseId: string; kind: string; massCase: string | null; weight: number; nz: number; balanceNz: number; tailLoad: number; wingLift: number; source: "typed" | "balance" | "none" }[];
  /** Why the balance could not be computed, where it could not. */
  problem: string | null;
}

/** The tuned discrete gust of one V–n set (design weight at an altitude), per gust speed. */
export interface GustFigure {
  label: string;
  massCase?: string;
  tuned?: { speed: string; veas: number; uRef: number; liftSlope: number; result: TunedGustResult; history: { s: number; gust: number; k: number }[] }[];
  /** Other categories (Pratt's formula gives the gust cases): Pratt's K_g beside the rigid plunge response to the 25-chord 1-cos gust it was derived from. */
  pratt?: { massRatio: number; prattKg: number; k: number; sAtPeak: number; history: { s: number; gust: number; k: number }[] };
}

/**
 * What the report draws beyond the snapshot's own numbers, computed from the snapshot by the
 * reports service when the PDF is rendered (so the stored snapshot stays as it was signed).
 */
export interface ReportFigures {
  /** The V–n diagram of the first design weight and altitude, and how many there are in all. */
  vn: { set: VnFigure; count: number };
  /** The distributions of the critical case. */
  critical: DistributionFigure;
  /** The wing's derived geometry (area, span, MAC, panels). */
  geometry: WingGeometry;
  /** The mass cases and the balance per case (null where the case has no masses). */
  masses?: MassesFigure | null;
  /** The tuned discrete gust of every V–n set (transport aeroplanes). */
  gusts?: GustFigure[];
  /** Equivalent airspeed of each load case (m/s), from its Mach number and altitude in the ISA, by case id. */
  eas?: Record<string, number>;
}
