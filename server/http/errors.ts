/**
 * The one error shape of the API, `{ error: { code, message, details? } }`,
 * and the one handler that turns anything thrown into it. Stack traces are
 * logged, never sent.
 */
import type { ErrorRequestHandler, RequestHandler } from 'express';
import { ZodError, type ZodType } from 'zod';
import { DomainError, InputError, SolveError, formatPath, type DomainErrorKind, type FieldIssue } from '../../shared/errors.js';
import type { ApiErrorBody } from '../../shared/api/common.js';

/** For the HTTP layer itself (middleware: sessions, tokens, CSRF, uploads); services throw domain errors (shared/errors.ts). */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
    this.name = 'HttpError';
  }
}


/** The status of each kind of domain error (shared/errors.ts). */
export const DOMAIN_STATUS: Readonly<Record<DomainErrorKind, number>> = {
  invalid: 400,
  unauthenticated: 401,
  forbidden: 403,
  not_found: 404,
  conflict: 409,
  gone: 410,
  too_many: 429,
  unavailable: 503,
};

/** Parses request input with a zod schema; failure is 400 listing every field. */
export function validate<T>(schema: ZodType<T>, input: unknown, what = 'request'): T {
  const r = schema.safeParse(input);
  if (r.success) return r.data;
  throw invalidInput(r.error, what);
}

function invalidInput(err: ZodError, what: string): HttpError {
  const fields: FieldIssue[] = err.issues.map((i) => ({ path: formatPath(i.path), message: i.message }));
  const first = fields[0];
  return new HttpError(400, 'invalid_input', `Invalid ${what}: ${first ? `${first.path}: ${first.message}` : 'unknown problem'}`, { fields });
}

const CONNECTION_CODES = new Set(['ECONNREFUSED', 'ECONNRESET', 'ETIMEDOUT', 'ENOTFOUND', 'EHOSTUNREACH', 'EPIPE', 'EAI_AGAIN', '57P01', '57P02', '57P03', '53300']);
const CONNECTION_MESSAGES = /timeout exceeded when trying to connect|Connection terminated|Query read timeout|connect ECONNREFUSED|Client has encountered a connection error|Cannot use a pool after calling end/i;

/** True for errors meaning "the database cannot be reached" (walks `cause` chains: Drizzle wraps pg errors). */
export function isDatabaseUnavailable(err: unknown): boolean {
  for (let e = err, depth = 0; e && depth < 6; depth++) {
    if (typeof e !== 'object') return false;
    const o = e as { code?: unknown; message?: unknown; cause?: unknown; errors?: unknown };
    if (typeof o.code === 'string' && (CONNECTION_CODES.has(o.code) || o.code.startsWith('08'))) return true;
    if (typeof o.message === 'string' && CONNECTION_MESSAGES.test(o.message)) return true;
    if (Array.isArray(o.errors) && o.errors.some((x) => isDatabaseUnavailable(x))) return true;
    e = o.cause;
  }
  return false;
}

function pgCode(err: unknown): string | undefined {
  for (let e = err, depth = 0; e && typeof e === 'object' && depth < 6; depth++) {
    const o = e as { code?: unknown; cause?: unknown };
    if (typeof o.code === 'string' && /^[0-9A-Z]{5}$/.test(o.code)) return o.code;
    e = o.cause;
  }
  return undefined;
}

export interface ErrorBody {
  status: number;
  code: string;
  message: string;
  details?: unknown;
}

/** Maps any thrown value to status + body. */
export function toErrorBody(err: unknown): ErrorBody {
  if (err instanceof HttpError) return { status: err.status, code: err.code, message: err.message, details: err.details };
  if (err instanceof DomainError) return { status: DOMAIN_STATUS[err.kind], code: err.code, message: err.message, details: err.details };
  if (err instanceof ZodError) {
    const h = invalidInput(err, 'request');
    return { status: 400, code: h.code, message: h.message, details: h.details };
  }
  if (err instanceof InputError) return { status: 400, code: 'invalid_input', message: err.message, details: { fields: err.issues } };
  if (err instanceof SolveError) return { status: 422, code: err.code, message: err.message, details: err.details };
  if (isDatabaseUnavailable(err)) {
    return { status: 503, code: 'database_unavailable', message: 'The database cannot be reached right now. Please try again shortly.' };
  }
  const o = (err ?? {}) as { type?: unknown; status?: unknown; expose?: unknown; message?: unknown };
  // body-parser errors
  if (o.type === 'entity.parse.failed') return { status: 400, code: 'malformed_json', message: 'The request body is not valid JSON' };
  if (o.type === 'entity.too.large') return { status: 413, code: 'payload_too_large', message: 'The request body is too large' };
  if (o.type === 'encoding.unsupported' || o.type === 'charset.unsupported') {
    return { status: 415, code: 'unsupported_encoding', message: 'The request body encoding is not supported' };
  }
  if (typeof o.status === 'number' && o.status >= 400 && o.status < 500 && o.expose && typeof o.message === 'string') {
    return { status: o.status, code: 'bad_request', message: o.message };
  }
  if (pgCode(err) === '23505') return { status: 409, code: 'conflict', message: 'That conflicts with an existing record' };
  // A character PostgreSQL cannot store (U+0000 in text or jsonb) that got past refuseNulCharacters (text.ts): the client's input.
  if (pgCode(err) === '22021' || pgCode(err) === '22P05') {
    return { status: 400, code: 'invalid_input', message: 'The request holds a character that cannot be stored (NUL, U+0000)' };
  }
  return { status: 500, code: 'internal_error', message: 'Something went wrong on the server; it has been logged.' };
}

export function sendError(res: Parameters<RequestHandler>[1], body: ErrorBody): void {
  const answer: ApiErrorBody = { error: { code: body.code, message: body.message, ...(body.details !== undefined ? { details: body.details } : {}) } };
  res.status(body.status).json(answer);
}

export const errorHandler: ErrorRequestHandler = (err, req, res, next) => {
  if (res.headersSent) return next(err);
  const body = toErrorBody(err);
  const log = req.log;
  if (body.status >= 500) log?.error({ err }, 'request failed');
  else log?.debug({ code: body.code }, 'request refused');
  if (body.status === 503) res.setHeader('Retry-After', '5');
  sendError(res, body);
};

export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(new HttpError(404, 'not_found', `No API route ${req.method} ${req.originalUrl.split('?')[0]}`));
};
