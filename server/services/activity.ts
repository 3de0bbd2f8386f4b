/**
 * The activity log: who changed what, when. Entries are written with
 * `recordActivity` inside the transaction of the change; times are stored
 * as timestamptz (UTC) and sent as ISO 8601 UTC; the CSV can add a column in
 * the reader's time zone.
 */
import { toCsv } from '../../shared/io/csv.js';
import { and, desc, eq, lt, sql } from 'drizzle-orm';
import type { Executor, Orm } from '../db/client.js';
import { activityLog, users } from '../db/schema.js';
import { DomainError } from '../../shared/errors.js';

export interface ActivityEntry {
  teamId: string;
  actorId: string | null;
  action: string;
  subjectType: 'team' | 'member' | 'invitation' | 'vehicle' | 'axle_design' | 'proposal' | 'configuration' | 'comment';
  subjectId?: string | null | undefined;
  designId?: string | null | undefined;
  summary: string;
}

export async function recordActivity(tx: Executor, e: ActivityEntry): Promise<void> {
  await tx.insert(activityLog).values({ ...e, subjectId: e.subjectId ?? null, designId: e.designId ?? null });
}

/** "renamed, archived, data changed" from what a revision changed. */
export function changeWords<K extends string>(
  change: { name?: string | undefined; archived?: boolean | undefined } & { [P in K]?: unknown },
  docWord: K,
): string {
  const words: string[] = [];
  if (change.name !== undefined) words.push(`renamed to "${change.name}"`);
  if (change.archived !== undefined) words.push(change.archived ? 'archived' : 'restored');
  if (change[docWord] !== undefined) words.push(`${docWord} changed`);
  return words.join(', ') || 'changed';
}

export interface ActivityQuery {
  designId?: string | undefined;
  /** Entries strictly older than this (paging). */
  before?: Date | undefined;
  /**
   * With `before`: the id of the last entry already seen, so the next page
   * starts right after it even when entries share its time (one transaction
   * writes them all at one time; the API's times are whole milliseconds).
   */
  beforeId?: string | undefined;
  limit: number;
}


export function checkTimeZone(tz: string): string {
  try {
    new Intl.DateTimeFormat('en-GB', { timeZone: tz });
    return tz;
  } catch {
    throw new DomainError('invalid', 'invalid_input', `Unknown time zone "${tz}"`, { fields: [{ path: 'timeZone', message: 'is not an IANA time zone' }] });
  }
}

function localTime(d: Date, tz: string): string {
  // sv-SE formats as "YYYY-MM-DD HH:MM:SS", unambiguous and sortable.
  return new Intl.DateTimeFormat('sv-SE', { timeZone: tz, year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).format(d);
}

export class Activity {
  constructor(private readonly orm: Orm) {}

  async list(teamId: string, q: ActivityQuery) {
    const where = [eq(activityLog.teamId, teamId)];
    if (q.designId) where.push(eq(activityLog.designId, q.designId));
    // Sorted and paged on the time as the API shows it (whole milliseconds), then the id.
    const atMs = sql`date_trunc('milliseconds', ${activityLog.at})`;
    if (q.before && q.beforeId) where.push(sql`(${atMs}, ${activityLog.id}) < (${q.before.toISOString()}::timestamptz, ${q.beforeId}::uuid)`);
    else if (q.before) where.push(lt(activityLog.at, q.before));
    return this.orm
      .select({
        id: activityLog.id,
        at: activityLog.at,
        actorName: users.displayName,
        action: activityLog.action,
        subjectType: activityLog.subjectType,
        subjectId: activityLog.subjectId,
        designId: activityLog.designId,
        summary: activityLog.summary,
      })
      .from(activityLog)
      .leftJoin(users, eq(users.id, activityLog.actorId))
      .where(and(...where))
      .orderBy(desc(atMs), desc(activityLog.id))
      .limit(q.limit);
  }

  async csv(teamId: string, q: ActivityQuery & { timeZone?: string | undefined }): Promise<string> {
    const rows = await this.list(teamId, q);
    const tz = q.timeZone;
    const header = ['at_utc', ...(tz ? [`at_local (${tz})`] : []), 'actor', 'action', 'subject_type', 'subject_id', 'summary'];
    return toCsv(
      header,
      rows.map((r) => [r.at.toISOString(), ...(tz ? [localTime(r.at, tz)] : []), r.actorName ?? '', r.action, r.subjectType, r.subjectId ?? '', r.summary]),
    );
  }
}
