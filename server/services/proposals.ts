/**
 * Geometry proposals for axle designs. An engineer proposes (for example by
 * applying an intent solution); the design is untouched until a designer
 * accepts, which writes the proposed corner as a new revision — only if the
 * design is still at the revision the proposal was made on, so a proposal
 * never overwrites geometry it did not see.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import { alias } from 'drizzle-orm/pg-core';
import type { Orm } from '../db/client.js';
import { axleDesignProposals, users, type ProposalStatus } from '../db/schema.js';
import { DomainError, notFound } from '../../shared/errors.js';
import type { Corner } from '../../shared/schema/corner.js';
import { storedCorner, type AxleDesigns, type AxleDesignView } from './axle-designs.js';
import { recordActivity } from './activity.js';
import { writeRevision } from './revisions.js';

export interface ProposalView {
  id: string;
  designId: string;
  baseRevision: number;
  status: ProposalStatus;
  message: string | null;
  origin: unknown;
  authorId: string | null;
  authorName: string | null;
  createdAt: Date;
  decidedByName: string | null;
  decidedAt: Date | null;
  decisionMessage: string | null;
  acceptedRevision: number | null;
  corner?: Corner;
}

const author = alias(users, 'author');
const decider = alias(users, 'decider');

const columns = {
  id: axleDesignProposals.id,
  designId: axleDesignProposals.designId,
  baseRevision: axleDesignProposals.baseRevision,
  status: axleDesignProposals.status,
  message: axleDesignProposals.message,
  origin: axleDesignProposals.origin,
  authorId: axleDesignProposals.authorId,
  authorName: author.displayName,
  createdAt: axleDesignProposals.createdAt,
  decidedByName: decider.displayName,
  decidedAt: axleDesignProposals.decidedAt,
  decisionMessage: axleDesignProposals.decisionMessage,
  acceptedRevision: axleDesignProposals.acceptedRevision,
};

const closed = (p: { status: string }) => new DomainError('conflict', 'proposal_closed', `This proposal is already ${p.status}`);

export class Proposals {
  constructor(
    private readonly orm: Orm,
    private readonly designs: AxleDesigns,
  ) {}

  /** The design's proposals, newest first (`design` as loaded for the team). */
  async list(design: { id: string }): Promise<ProposalView[]> {
    return this.orm
      .select(columns)
      .from(axleDesignProposals)
      .leftJoin(author, eq(author.id, axleDesignProposals.authorId))
      .leftJoin(decider, eq(decider.id, axleDesignProposals.decidedBy))
      .where(eq(axleDesignProposals.designId, design.id))
      .orderBy(desc(axleDesignProposals.createdAt));
  }

  /** One proposal of the design (`design` as loaded for the team); 404 when it is another design's. */
  async getOf(design: { id: string }, proposalId: string): Promise<ProposalView> {
    const designId = design.id;
    const [p] = await this.orm
      .select({ ...columns, corner: axleDesignProposals.corner })
      .from(axleDesignProposals)
      .leftJoin(author, eq(author.id, axleDesignProposals.authorId))
      .leftJoin(decider, eq(decider.id, axleDesignProposals.decidedBy))
      .where(and(eq(axleDesignProposals.id, proposalId), eq(axleDesignProposals.designId, designId)));
    if (!p) throw notFound('Proposal');
    return { ...p, corner: storedCorner(p.corner) };
  }

  /** A new open proposal on `design` (as loaded for the team). */
  async create(
    teamId: string,
    design: AxleDesignView,
    authorId: string,
    input: { corner: Corner; baseRevision: number; message?: string | undefined; origin?: Record<string, unknown> | undefined },
  ): Promise<ProposalView> {
    const designId = design.id;
    if (input.baseRevision !== design.revision) throw this.outdated(input.baseRevision, design);
    const p = await this.orm.transaction(async (tx) => {
      const [row] = await tx
        .insert(axleDesignProposals)
        .values({ designId, baseRevision: input.baseRevision, corner: input.corner, message: input.message ?? null, origin: input.origin ?? null, authorId })
        .returning({ id: axleDesignProposals.id });
      await recordActivity(tx, {
        teamId,
        actorId: authorId,
        action: 'proposal.create',
        subjectType: 'proposal',
        subjectId: row!.id,
        designId,
        summary: `Proposed geometry for "${design.name}" on revision ${input.baseRevision}${input.message ? ` (${input.message})` : ''}`,
      });
      return row!;
    });
    return this.getOf(design, p.id);
  }

  /**
   * Writes the proposed corner as the design's next revision (status `accepted`).
   * `design` and `proposal` as loaded for the team (routes/loaders.ts); the
   * proposal is read again under a row lock.
   */
  async accept(teamId: string, design: { id: string }, proposal: { id: string }, deciderId: string, message?: string): Promise<{ proposal: ProposalView; design: AxleDesignView }> {
    const designId = design.id;
    const proposalId = proposal.id;
    await this.orm.transaction(async (tx) => {
      const [p] = await tx
        .select()
        .from(axleDesignProposals)
        .where(and(eq(axleDesignProposals.id, proposalId), eq(axleDesignProposals.designId, designId)))
        .for('update');
      if (!p) throw notFound('Proposal');
      if (p.status !== 'open') throw closed(p);
      const { row } = await writeRevision(tx, this.designs.document, {
        teamId,
        id: designId,
        baseRevision: p.baseRevision,
        change: { corner: p.corner, status: 'accepted' },
        authorId: deciderId,
        // The revision is the proposer's: their own note and their name, in the history and on the design alike.
        // Who accepted it, and what they said, stay on the proposal (decidedBy, decisionMessage) and in the activity.
        message: p.message,
        revisionAuthorId: p.authorId,
        conflict: (current) => this.outdated(p.baseRevision, current),
        activity: (_previous, row) => ({
          action: 'proposal.accept',
          subjectType: 'proposal',
          subjectId: proposalId,
          designId,
          summary: `Accepted a proposal for "${row.name}" as revision ${row.revision}`,
        }),
      });
      await tx
        .update(axleDesignProposals)
        .set({ status: 'accepted', decidedBy: deciderId, decidedAt: sql`now()`, decisionMessage: message ?? null, acceptedRevision: row.revision })
        .where(eq(axleDesignProposals.id, proposalId));
    });
    return { proposal: await this.getOf(design, proposalId), design: await this.designs.get(teamId, designId) };
  }

  async reject(teamId: string, design: AxleDesignView, proposal: { id: string }, deciderId: string, message?: string): Promise<ProposalView> {
    return this.close(teamId, design, proposal.id, 'rejected', deciderId, message);
  }

  /** Only the author may withdraw their own open proposal. */
  async withdraw(teamId: string, design: AxleDesignView, proposal: ProposalView, userId: string): Promise<ProposalView> {
    if (proposal.authorId !== userId) throw new DomainError('forbidden', 'forbidden', 'Only the author can withdraw a proposal');
    return this.close(teamId, design, proposal.id, 'withdrawn', userId);
  }

  /** `design` as loaded for the team; only an open proposal closes (else 409 with its state now). */
  private async close(teamId: string, design: AxleDesignView, proposalId: string, status: 'rejected' | 'withdrawn', userId: string, message?: string) {
    const designId = design.id;
    const updated = await this.orm.transaction(async (tx) => {
      const rows = await tx
        .update(axleDesignProposals)
        .set({ status, decidedBy: userId, decidedAt: sql`now()`, decisionMessage: message ?? null })
        .where(and(eq(axleDesignProposals.id, proposalId), eq(axleDesignProposals.designId, designId), eq(axleDesignProposals.status, 'open')))
        .returning({ id: axleDesignProposals.id });
      if (rows.length) {
        const verb = status === 'rejected' ? 'Rejected' : 'Withdrew';
        await recordActivity(tx, { teamId, actorId: userId, action: `proposal.${status === 'rejected' ? 'reject' : 'withdraw'}`, subjectType: 'proposal', subjectId: proposalId, designId, summary: `${verb} a proposal for "${design.name}"${message ? ` (${message})` : ''}` });
      }
      return rows;
    });
    if (!updated.length) throw closed(await this.getOf(design, proposalId));
    return this.getOf(design, proposalId);
  }

  private outdated(baseRevision: number, current: AxleDesignView): DomainError {
    return new DomainError('conflict',
      'proposal_outdated',
      `The design is at revision ${current.revision}, but the proposal was made on revision ${baseRevision}; propose again on the current geometry`,
      { baseRevision, current },
    );
  }
}
