/** Version of the numerical engine, written into every result. */
export const ENGINE_VERSION = "0.7.0";

export { EngineError, isEngineError } from "./errors";
export type { EngineErrorCode } from "./errors";
export * from "./atmosphere";
export * from "./compressibility";
export * from "./planform";
export * from "./sections";
export type { SpanwiseMethod, SpanwiseOptions, SpanwiseResult, SpanwiseSystem, CompressibleSection } from "./spanwise";
export { compressibleSectionAt, sectionCriticalMach } from "./spanwise";
export { buildLiftingLine, LIFTING_LINE_DEFAULT_TERMS, LIFTING_LINE_MAX_SWEEP_DEG } from "./lifting-line";
export type { LiftingLineResult } from "./lifting-line";
export { factorDense, luFactor, luSolve } from "./linear-solve";
export type { DenseMethod, DenseSolver, LuFactors } from "./linear-solve";
export { buildVortexLattice, VORTEX_LATTICE_DEFAULT_STRIPS, VORTEX_LATTICE_MAX_STRIPS } from "./vortex-lattice";
export * from "./loads";
export * from "./mass";
export * from "./balance";
export * from "./gust-response";
export * from "./flaps";
export * from "./rolling";
export * from "./superposition";
export * from "./mach-grid";
export * from "./plausibility";
export * from "./load-case";
export * from "./envelope";
export * from "./certification";
export * from "./schrenk";
