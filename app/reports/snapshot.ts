import type { BasisData, DistributionData, EnvelopeData, LoadsData, PlanformData, SectionsData } from "~/domain/step-data";
import type { CaseFileInput, CaseResult } from "~/exchange";

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
  };
  /** The exchange document the results were computed from, and the results (spanwright.result/1). */
  exchange: CaseFileInput;
  result: CaseResult;
  /** Flagged cases with their dispositions. */
  flags: { id: string; reasons: string[]; action: string; comment: string }[];
  signatures: SignatureLine[];
}
