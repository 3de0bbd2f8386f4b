/** Review comments on configurations: threads (a root comment and its replies), optionally pinned to a result, resolved or reopened. */
import { and, asc, eq, sql } from 'drizzle-orm';
import type { Orm } from '../../db/client.js';
import { reviewComments, users } from '../../db/schema.js';
import { DomainError, notFound } from '../../../shared/errors.js';
import { recordActivity } from '../activity.js';
import type { ConfigurationView } from './store.js';

/** Each method takes the configuration as loaded for its team (routes/loaders.ts). */
export class ConfigurationComments {
  constructor(private readonly orm: Orm) {}

  async comments(c: { id: string }) {
    const id = c.id;
    const rows = await this.orm
      .select({
        id: reviewComments.id,
        revision: reviewComments.revision,
        parentId: reviewComments.parentId,
        resultRef: reviewComments.resultRef,
        body: reviewComments.body,
        authorId: reviewComments.authorId,
        authorName: users.displayName,
        createdAt: reviewComments.createdAt,
        resolvedAt: reviewComments.resolvedAt,
      })
      .from(reviewComments)
      .leftJoin(users, eq(users.id, reviewComments.authorId))
      .where(eq(reviewComments.configurationId, id))
      .orderBy(asc(reviewComments.createdAt));
    // Threads: each root comment with its replies in order.
    const threads = rows.filter((r) => r.parentId === null).map((root) => ({ ...root, resolved: root.resolvedAt !== null, replies: [] as typeof rows }));
    const byId = new Map(threads.map((t) => [t.id, t]));
    for (const r of rows) if (r.parentId !== null) byId.get(r.parentId)?.replies.push(r);
    return threads;
  }

  async addComment(teamId: string, c: ConfigurationView, authorId: string, input: { body: string; resultRef?: string | undefined; parentId?: string | undefined }) {
    const id = c.id;
    if (input.parentId !== undefined) {
      const [p] = await this.orm
        .select({ parentId: reviewComments.parentId })
        .from(reviewComments)
        .where(and(eq(reviewComments.id, input.parentId), eq(reviewComments.configurationId, id)));
      if (!p) throw new DomainError('not_found', 'not_found', 'The comment replied to was not found', { field: 'parentId' });
      if (p.parentId !== null) throw new DomainError('invalid', 'invalid_input', 'Reply to the first comment of a thread', { fields: [{ path: 'parentId', message: 'is a reply itself' }] });
    }
    return this.orm.transaction(async (tx) => {
      const [row] = await tx
        .insert(reviewComments)
        .values({ configurationId: id, revision: c.revision, parentId: input.parentId ?? null, resultRef: input.resultRef ?? null, body: input.body, authorId })
        .returning();
      if (!row) throw new Error('insert returned nothing');
      const on = input.resultRef ? ` on ${input.resultRef}` : '';
      await recordActivity(tx, { teamId, actorId: authorId, action: 'comment.create', subjectType: 'comment', subjectId: row.id, summary: `Commented${on} on configuration "${c.name}": ${input.body.slice(0, 200)}` });
      return row;
    });
  }

  async resolveThread(c: { id: string }, commentId: string, userId: string, resolved: boolean) {
    const id = c.id;
    const [row] = await this.orm
      .update(reviewComments)
      .set(resolved ? { resolvedAt: sql`now()`, resolvedBy: userId } : { resolvedAt: null, resolvedBy: null })
      .where(and(eq(reviewComments.id, commentId), eq(reviewComments.configurationId, id), sql`${reviewComments.parentId} IS NULL`))
      .returning();
    if (!row) throw notFound('Comment thread');
    return { ...row, resolved: row.resolvedAt !== null };
  }
}
