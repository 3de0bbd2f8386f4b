/** Structured request logs (pino) with a request id per request, echoed in X-Request-Id. */
import { randomUUID } from 'node:crypto';
import type { RequestHandler } from 'express';
import { pino, type Logger } from 'pino';
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

export function createLogger(level: LogLevel): Logger {
  return pino({
    level,
    base: { service: 'rollwise' },
    redact: { paths: ['req.headers.cookie', 'password', 'currentPassword', 'newPassword'], remove: true },
  });
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
      const line = { method: req.method, url: req.originalUrl, status: res.statusCode, ms: Math.round(ms * 10) / 10 };
      if (res.statusCode >= 500) req.log.error(line, 'request');
      else req.log.info(line, 'request');
    });
    next();
  };
}
