/**
 * Typed errors of the engineering core. Every entry point (library, CLI,
 * HTTP, worker) reports bad input and unsolvable geometry through these, so
 * the message always names the field, point, travel or link involved.
 */
import type { ZodType } from 'zod';

export interface FieldIssue {
  /** Dotted path of the offending field, e.g. `points.tieRodInner[2]`. */
  path: string;
  message: string;
}

/** Input that fails its schema or a semantic rule (CLI exit 2, HTTP 400). */
export class InputError extends Error {
  readonly code = 'invalid_input';
  constructor(
    message: string,
    readonly issues: FieldIssue[],
  ) {
    super(message);
    this.name = 'InputError';
  }
}

export type SolveErrorCode = 'unreachable_pose' | 'no_convergence' | 'singular_geometry' | 'time_limit' | 'too_many_poses';

/** Geometry that cannot be solved (CLI exit 3, HTTP 422). Never NaN. */
export class SolveError extends Error {
  constructor(
    readonly code: SolveErrorCode,
    message: string,
    readonly details: Record<string, unknown> = {},
  ) {
    super(message);
    this.name = 'SolveError';
  }
}

export function formatPath(path: ReadonlyArray<PropertyKey>): string {
  let out = '';
  for (const p of path) {
    if (typeof p === 'number') out += `[${p}]`;
    else out += out ? `.${String(p)}` : String(p);
  }
  return out || '(root)';
}

/** Parses with a zod schema; on failure throws an InputError listing every field. */
export function parseOrThrow<T>(schema: ZodType<T>, input: unknown, what = 'input'): T {
  const r = schema.safeParse(input);
  if (r.success) return r.data;
  const issues = r.error.issues.map((i) => ({ path: formatPath(i.path), message: i.message }));
  const first = issues[0];
  throw new InputError(`Invalid ${what}: ${first ? `${first.path}: ${first.message}` : 'unknown problem'}`, issues);
}

/**
 * What kind of refusal a domain error is. Services say only this; the HTTP
 * error handler (server/http/errors.ts) maps each kind to its status, the CLI
 * and workers to their own answers.
 */
export type DomainErrorKind =
  | 'invalid'
  | 'unauthenticated'
  | 'forbidden'
  | 'not_found'
  | 'conflict'
  | 'gone'
  /** The caller already has as much work running as allowed; wait for some to finish. */
  | 'too_many'
  /** The server cannot do this right now (busy, or a facility is not installed); try again or another way. */
  | 'unavailable';

/** A rule of the product refused the request: `code` is the API's error code, `details` what the caller needs to recover. */
export class DomainError extends Error {
  constructor(
    readonly kind: DomainErrorKind,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'DomainError';
  }
}

/** `<what> not found` (also for things the caller may not see: it never says which). */
export const notFound = (what = 'Resource', details?: unknown): DomainError =>
  new DomainError('not_found', 'not_found', `${what} not found`, details);

/** A write based on an old revision of a document; `current` is the state now, so nothing is lost. */
export const staleRevision = (baseRevision: number, current: { revision: number }): DomainError =>
  new DomainError(
    'conflict',
    'stale_revision',
    `Someone saved revision ${current.revision} after the revision ${baseRevision} you started from; reload and re-apply your change`,
    { baseRevision, current },
  );
