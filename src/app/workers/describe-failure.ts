import { InputError, SolveError } from '../../../shared/errors';
import type { AnalysisFailure } from './analysis-types';

/**
 * Engine errors as plain data: InputError lists fields, SolveError names travel, rack and link.
 * Its own module so that a worker answering failures (the intent worker) loads no engine or schema for it.
 */
export function describeFailure(error: unknown): AnalysisFailure {
  if (error instanceof InputError) return { code: error.code, message: error.message, details: error.issues };
  if (error instanceof SolveError) return { code: error.code, message: error.message, details: error.details };
  return { code: 'engine_error', message: error instanceof Error ? error.message : String(error) };
}
