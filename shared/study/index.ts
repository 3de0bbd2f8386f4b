/**
 * Tolerance studies and design sweeps (docs/studies.md): the request and
 * spec schemas, the plan, one chunk's run, the combination of chunks into a
 * result, a sweep variant's corner and the CSV export. Pure; used by the
 * server, the queue workers, the CLI and the browser.
 */
export {
  studyRequestSchema,
  studySpecSchema,
  studyTargetSchema,
  toleranceSchema,
  sweepFactorSchema,
  setupSchema,
  studyAnalysisSchema,
  MAX_STUDY_SAMPLES,
  DEFAULT_CHUNK_SAMPLES,
  MAX_TOLERANCES,
  MAX_SWEEP_FACTORS,
  FIXED_POINTS,
  type StudyRequest,
  type StudySpec,
  type SweepSpec,
} from './schema.js';
export {
  planStudy,
  runStudyChunk,
  combineStudyChunks,
  chunkToWire,
  chunkFromWire,
  withFactorLabels,
  variantCorner,
  sampleFactors,
  prepareStudy,
  SENSITIVITY_METHOD,
  PERCENTILE_METHOD,
  type StudyPlan,
  type StudyChunkResult,
  type ChunkWire,
  type StudyResult,
  type OutputResult,
  type BreachProbability,
  type TornadoBar,
  type ResponseSurface,
  type MainEffect,
  type VariantPoint,
} from './run.js';
export type { FactorInfo, OutputDefinition } from './engine.js';
export { studyResultCsv } from './csv.js';
export { studyKeyFigures, KEY_FIGURE_OUTPUTS, type StudyKeyFigure, type KeyFigureSource } from './key-figures.js';
