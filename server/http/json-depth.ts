/**
 * Refuses JSON bodies nested deeper than any Rollwise document needs. Deep
 * nesting is cheap to send and expensive to walk (structured cloning to a
 * worker thread recurses), so it is turned away at the door with a 400.
 */
import type { RequestHandler } from 'express';
import { HttpError } from './errors.js';

/** Our deepest document (a corner in an intent in a request) is under 10 levels. */
export const MAX_JSON_DEPTH = 64;

/** Depth of a parsed JSON value, walked iteratively (no recursion to overflow). */
export function jsonDepth(value: unknown, stopAt = Infinity): number {
  let max = 0;
  const stack: Array<[unknown, number]> = [[value, 1]];
  while (stack.length) {
    const [v, d] = stack.pop()!;
    if (v === null || typeof v !== 'object') continue;
    if (d > max) max = d;
    if (max > stopAt) return max;
    for (const child of Array.isArray(v) ? v : Object.values(v)) stack.push([child, d + 1]);
  }
  return max;
}

export function limitJsonDepth(maxDepth = MAX_JSON_DEPTH): RequestHandler {
  return (req, _res, next) => {
    if (req.body !== undefined && typeof req.body === 'object' && jsonDepth(req.body, maxDepth) > maxDepth) {
      return next(new HttpError(400, 'invalid_input', `The request body is nested deeper than ${maxDepth} levels`, { fields: [{ path: '(root)', message: `nested deeper than ${maxDepth} levels` }] }));
    }
    next();
  };
}
