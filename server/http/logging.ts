/**
 * Structured request logs (pino) with a request id per request, echoed in
 * X-Request-Id. Nothing that can hold a secret is written (issue 12 §6): the
 * URL is logged without its query string and with link tokens in the path
 * replaced (`loggableUrl`); errors are logged by `errorForLog`, which keeps
 * the error's type, message, stack, codes and SQL text but never its
 * parameters (a failed INSERT INTO users carried the password hash in
 * Drizzle's message and `params`) nor PostgreSQL's `detail` (it quotes the
 * values of a conflicting row); cookies and password fields are removed.
 */
import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import { pino, type DestinationStream, type Logger } from 'pino';
import type { LogLevel } from '../config.js';

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      id: string;
      log: Logger;
    }
  }
}

/** Error properties that never reach the log: query parameters and row values (they can hold hashes, tokens, addresses). */
const UNLOGGED_ERROR_KEYS = new Set(['params', 'parameters', 'values', 'detail', 'body', 'where', 'internalQuery']);
/** Drizzle's "Failed query: …\nparams: …" message: everything from the parameters on is cut. */
function scrubMessage(message: string): string {
  const at = message.indexOf('\nparams:');
  return at < 0 ? message : `${message.slice(0, at)}\nparams: [not logged]`;
}

/** An error as the log shows it: what it is and where, never the values it was working on. */
export function errorForLog(err: unknown, depth = 0): unknown {
  if (err === null || typeof err !== 'object') return err;
  const e = err as Partial<Error> & Record<string, unknown>;
  const out: Record<string, unknown> = { type: e.constructor?.name ?? 'Error' };
  const message = typeof e.message === 'string' ? e.message : undefined;
  if (message !== undefined) out['message'] = scrubMessage(message);
  if (typeof e.stack === 'string') {
    // The stack starts with the message: replace it there; a stack that does not is cut to its frames.
    out['stack'] = message !== undefined && e.stack.includes(message) ? e.stack.replace(message, scrubMessage(message)) : e.stack.slice(Math.max(0, e.stack.indexOf('\n    at ')));
  }
  for (const [k, v] of Object.entries(e)) {
    if (UNLOGGED_ERROR_KEYS.has(k) || k === 'cause' || k === 'message' || k === 'stack') continue;
    if (typeof v === 'string') out[k] = scrubMessage(v).slice(0, 2000);
    else if (v === null || typeof v === 'number' || typeof v === 'boolean') out[k] = v;
  }
  if (e.cause !== undefined && depth < 5) out['cause'] = errorForLog(e.cause, depth + 1);
  return out;
}

export function createLogger(level: LogLevel, destination?: DestinationStream): Logger {
  const options = {
    level,
    base: { service: 'rollwise' },
    serializers: { err: (err: unknown) => errorForLog(err) },
    redact: { paths: ['req.headers.cookie', 'req.headers.authorization', 'password', 'currentPassword', 'newPassword', 'token'], remove: true },
  };
  return destination ? pino(options, destination) : pino(options);
}

/** Path segments that are credentials (an invitation link's token). */
const SECRET_SEGMENTS = /(\/invitations\/)[^/?#]+/gi;

/** The request URL for the log: no query string (it can carry anything), link tokens replaced. */
export function loggableUrl(originalUrl: string): string {
  const path = originalUrl.split('?')[0]!.split('#')[0]!;
  return path.replace(SECRET_SEGMENTS, '$1[token]');
}

const ACCEPTABLE_ID = /^[A-Za-z0-9._-]{8,100}$/;

export function requestLogger(logger: Logger): RequestHandler {
  return (req, res, next) => {
    const incoming = req.get('x-request-id');
    req.id = incoming && ACCEPTABLE_ID.test(incoming) ? incoming : randomUUID();
    req.log = logger.child({ reqId: req.id });
    res.setHeader('X-Request-Id', req.id);
    const start = process.hrtime.bigint();
    res.on('finish', () => {
      const ms = Number(process.hrtime.bigint() - start) / 1e6;
      const line = { method: req.method, url: loggableUrl(req.originalUrl), status: res.statusCode, ms: Math.round(ms * 10) / 10 };
      if (res.statusCode >= 500) req.log.error(line, 'request');
      else req.log.info(line, 'request');
    });
    next();
  };
}
