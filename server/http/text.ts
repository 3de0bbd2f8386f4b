/**
 * No NUL characters in text (issue 12 §6). PostgreSQL cannot store U+0000
 * in text or jsonb, so a display name, vehicle name, comment or note holding
 * one used to reach the database and fail there as a 500. Every text the API
 * takes is checked here once, whatever route or schema it is for: the query
 * string on every request, the JSON body when its raw bytes held `\u0000`
 * (body.ts marks it, so ordinary bodies are not walked twice), and the text
 * fields of multipart uploads (upload.ts). The answer is 400 `invalid_input`
 * naming each field, as a schema failure would.
 */
import type { RequestHandler } from 'express';
import { formatPath, type FieldIssue } from '../../shared/errors.js';
import { HttpError } from './errors.js';

const NUL = '\u0000';
/** Enough to name the fields; a body full of NULs is not listed in full. */
const MAX_REPORTED = 20;

/** Paths of every string (value or key) holding a NUL, walked iteratively (bounded by the body limit). */
export function nulPaths(value: unknown, root: ReadonlyArray<PropertyKey> = []): string[] {
  const found: string[] = [];
  const stack: Array<[unknown, ReadonlyArray<PropertyKey>]> = [[value, root]];
  while (stack.length && found.length < MAX_REPORTED) {
    const [v, path] = stack.pop()!;
    if (typeof v === 'string') {
      if (v.includes(NUL)) found.push(formatPath(path));
    } else if (Array.isArray(v)) {
      for (let i = v.length - 1; i >= 0; i--) stack.push([v[i], [...path, i]]);
    } else if (v !== null && typeof v === 'object') {
      for (const [k, child] of Object.entries(v)) {
        // A key with a NUL is named with the NUL shown as \0 (the key itself cannot be printed).
        if (k.includes(NUL)) found.push(formatPath([...path, k.replaceAll(NUL, '\\0')]));
        else stack.push([child, [...path, k]]);
      }
    }
  }
  return found;
}

export function nulError(paths: readonly string[], where: string): HttpError {
  const fields: FieldIssue[] = paths.map((path) => ({ path, message: 'must not contain a NUL character (U+0000)' }));
  return new HttpError(400, 'invalid_input', `Invalid ${where}: ${paths[0]} must not contain a NUL character (U+0000)`, { fields });
}

/** 400 when the query string or the JSON body holds a NUL character, naming the fields. */
export const refuseNulCharacters: RequestHandler = (req, _res, next) => {
  const inQuery = nulPaths(req.query);
  if (inQuery.length) return next(nulError(inQuery, 'query'));
  if (req.bodyMayHoldNul) {
    const inBody = nulPaths(req.body);
    if (inBody.length) return next(nulError(inBody, 'request'));
  }
  next();
};
