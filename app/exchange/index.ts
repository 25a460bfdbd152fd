export * from "./schema";
export { parseCase, formatPath } from "./parse";
export type { CaseProblem, ParseCaseResult } from "./parse";
export { DIRECT_MACH_LIMIT, massItemOf, runCase, wingModelOf } from "./run";
export type { RunOptions, RunProgress } from "./run";
export { resultToCsv } from "./csv";
export { parseSections, SECTIONS_SCHEMA_ID, SectionsFileSchema, withSections } from "./sections";
export type { SectionsFile } from "./sections";
export { analyzeDocument } from "./analyze";
