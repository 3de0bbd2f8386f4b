/**
 * zod numbers held to a plausible range (shared/schema/ranges.ts): outside
 * it the issue names the value, what it is and the accepted range. The
 * corner, vehicle and intent schemas build their numeric fields with it.
 */
import * as z from 'zod';
import { impossibleValue, type InputRange } from './ranges.js';

/** `base` (already finite, positive… as its schema says) held to `range`; `what` prefixes the message (the field's key). */
export function inRange<T extends z.ZodNumber>(base: T, range: InputRange, what?: string) {
  return base.check((ctx) => {
    // A value the base already refused (not finite, not positive) gets that one issue, not two.
    if (ctx.issues.length > 0 || !Number.isFinite(ctx.value)) return;
    const why = impossibleValue(range, ctx.value);
    if (why) // `params` carry the range, so a screen can say it in the user's words (schema/issue-words.ts).
    if (why) ctx.issues.push({ code: 'custom', message: what ? `${what}: ${why}` : why, input: ctx.value, params: { range, value: ctx.value }, continue: true });
  });
}
