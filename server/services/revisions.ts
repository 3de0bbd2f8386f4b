/** Helpers shared by revisioned documents (vehicles, axle designs). */
import type { ZodType } from 'zod';
import { HttpError, validate } from '../http/errors.js';

/** 409 for a write based on an old revision; the caller gets the current state so nothing is lost. */
export function staleRevision(baseRevision: number, current: { revision: number }): HttpError {
  return new HttpError(
    409,
    'stale_revision',
    `Someone saved revision ${current.revision} after the revision ${baseRevision} you started from; reload and re-apply your change`,
    { baseRevision, current },
  );
}

/** Upgrades an engineering document to the current format and validates it (400 listing fields). */
export function parseDocument<T>(schema: ZodType<T>, upgrade: (doc: unknown) => unknown, doc: unknown, what: string): T {
  return validate(schema, upgrade(doc), what);
}

export interface RevisionRow {
  revision: number;
  message: string | null;
  authorName: string | null;
  createdAt: Date;
}
