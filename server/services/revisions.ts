/**
 * The one revision writer of revisioned documents (vehicles, axle designs,
 * configurations; proposals accept through the axle design's).
 *
 * A new revision is written in one transaction: the document's row is locked
 * (`SELECT … FOR UPDATE`) and its revision compared with the one the writer
 * started from; only then is the row updated to the next revision, the
 * immutable revision row inserted and the activity entry recorded. A stale
 * write is a `stale_revision` conflict carrying the current state, so the
 * caller loses nothing; two writers on the same revision queue on the lock
 * and the second one gets the conflict.
 */
import type { ZodType } from 'zod';
import type { Executor } from '../db/client.js';
import { notFound, parseOrThrow, staleRevision } from '../../shared/errors.js';
import { recordActivity, type ActivityEntry } from './activity.js';

/** Upgrades an engineering document to the current format and validates it (400 listing fields). */
export function parseDocument<T>(schema: ZodType<T>, upgrade: (doc: unknown) => unknown, doc: unknown, what: string): T {
  return parseOrThrow(schema, upgrade(doc), what);
}

export interface RevisionRow {
  revision: number;
  message: string | null;
  authorName: string | null;
  createdAt: Date;
}

/** How one kind of document is locked, updated and its revision row written; the writer does the rest. */
export interface RevisionedDocument<Row extends { id: string; revision: number }, Change, View extends { revision: number } = { revision: number }> {
  /** Names the document in "… not found". */
  readonly what: string;
  /** The team's document row, locked for the transaction; undefined when it is not there (or not the team's). */
  lock(tx: Executor, teamId: string, id: string): Promise<Row | undefined>;
  /** Writes `change` on the locked row as `revision` (with updatedAt/updatedBy) and returns the updated row. */
  update(tx: Executor, previous: Row, revision: number, change: Change, authorId: string): Promise<Row>;
  /** Inserts the immutable revision row of `row`. */
  insertRevision(tx: Executor, row: Row, o: { message: string | null; authorId: string | null }): Promise<void>;
  /** The document as the API shows it, for the conflict's `current`. */
  view(tx: Executor, teamId: string, id: string): Promise<View>;
}

export interface RevisionWrite<Row, Change, View = { revision: number }> {
  teamId: string;
  id: string;
  /** The revision the writer started from. */
  baseRevision: number;
  change: Change;
  /** Who writes the revision (updatedBy, the activity's actor). */
  authorId: string;
  message: string | null;
  /** The revision's author when it is not the writer (an accepted proposal's author). */
  revisionAuthorId?: string | null | undefined;
  /** The activity entry of the new revision. */
  activity(previous: Row, row: Row): Omit<ActivityEntry, 'teamId' | 'actorId'>;
  /** The conflict for a write on an old revision (default `stale_revision` with the current view). */
  conflict?(current: View): Error;
}

/** Writes the next revision of a document inside `tx`; answers the row before and after. */
export async function writeRevision<Row extends { id: string; revision: number }, Change, View extends { revision: number }>(
  tx: Executor,
  doc: RevisionedDocument<Row, Change, View>,
  w: RevisionWrite<Row, Change, View>,
): Promise<{ previous: Row; row: Row }> {
  const previous = await doc.lock(tx, w.teamId, w.id);
  if (!previous) throw notFound(doc.what);
  if (previous.revision !== w.baseRevision) {
    const current = await doc.view(tx, w.teamId, w.id);
    throw w.conflict ? w.conflict(current) : staleRevision(w.baseRevision, current);
  }
  // The document names its latest revision's author, as the revision list does.
  const revisionAuthor = w.revisionAuthorId === undefined || w.revisionAuthorId === null ? w.authorId : w.revisionAuthorId;
  const row = await doc.update(tx, previous, previous.revision + 1, w.change, revisionAuthor);
  await doc.insertRevision(tx, row, { message: w.message, authorId: w.revisionAuthorId === undefined ? w.authorId : w.revisionAuthorId });
  await recordActivity(tx, { teamId: w.teamId, actorId: w.authorId, ...w.activity(previous, row) });
  return { previous, row };
}
