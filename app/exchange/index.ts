export * from "./schema";
export { parseCase, formatPath } from "./parse";
export type { CaseProblem, ParseCaseResult } from "./parse";
export { massItemOf, runCase, wingModelOf } from "./run";
export type { RunOptions } from "./run";
export { resultToCsv } from "./csv";
