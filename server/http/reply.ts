/**
 * Answers checked against the API's response types (shared/api): the handler
 * says which wire type it sends, and the compiler checks the service's value
 * against it. `res.json` writes a Date as an ISO 8601 string, so a Date may
 * stand where the wire type has a string.
 *
 *   reply<Configuration>(res, await loaded(req, 'configuration'));
 */
import type { Response } from 'express';

/** A value that `res.json` turns into the wire type `T`. */
export type Sendable<T> = T extends string
  ? T | Date
  : T extends number | boolean | null | undefined
    ? T
    : T extends readonly (infer U)[]
      ? readonly Sendable<U>[]
      : T extends object
        ? { readonly [K in keyof T]: Sendable<T[K]> }
        : T;

export function reply<T>(res: Response, body: Sendable<T>, status = 200): void {
  res.status(status).json(body);
}
