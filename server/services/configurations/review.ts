/**
 * The review state machine of configurations:
 *
 *   draft ──submit──▶ in_review ──approve──▶ approved ──release──▶ released ──validate──▶ validated
 *     ▲                 │  └──request-changes──▶ changes_requested
 *     └────withdraw─────┘
 *
 * Decisions (approve, request changes, release, validate) are the
 * reviewer's, and never on a configuration any revision of whose current
 * review round — or any vehicle / axle design revision it references — the
 * reviewer authored. Approval freezes inputs, computed results and the engine
 * version (configurations/approvals.ts reads them back).
 */
import { and, eq, or, sql } from 'drizzle-orm';
import type { Executor, Orm } from '../../db/client.js';
import {
  axleDesignRevisions,
  configurationApprovals,
  configurationRevisions,
  configurations,
  configurationTransitions,
  memberships,
  teams,
  users,
  vehicleRevisions,
  type ConfigurationStatus,
} from '../../db/schema.js';
import { DomainError, staleRevision } from '../../../shared/errors.js';
import { ENGINE_VERSION } from '../../../shared/version.js';
import type { ReviewAction } from '../../../shared/api/configurations.js';
import { hasPermission, type Permission, type Role } from '../../permissions.js';
import { enqueueMail, type OutgoingMail } from '../../mail/outbox.js';
import { mailText } from '../../mail/messages.js';
import { recordActivity } from '../activity.js';
import type { ConfigurationStore, ConfigurationView } from './store.js';
import type { ConfigurationCompute } from './compute.js';
import type { GateInput, ReviewGates } from '../review-gates.js';
import { ACTION_WORDS, STATUS_WORDS } from '../review-words.js';

export type { ReviewAction };

/** The transition table: from which status, to which, needing which permission; decisions are never on one's own work. */
export const TRANSITIONS: Readonly<Record<ReviewAction, { from: readonly ConfigurationStatus[]; to: ConfigurationStatus; permission: Permission; decision: boolean }>> = {
  submit: { from: ['draft'], to: 'in_review', permission: 'review:submit', decision: false },
  withdraw: { from: ['in_review'], to: 'draft', permission: 'review:submit', decision: false },
  approve: { from: ['in_review'], to: 'approved', permission: 'review:decide', decision: true },
  'request-changes': { from: ['in_review'], to: 'changes_requested', permission: 'review:decide', decision: true },
  release: { from: ['approved'], to: 'released', permission: 'review:decide', decision: true },
  validate: { from: ['released'], to: 'validated', permission: 'review:decide', decision: true },
};

const invalidTransition = (action: ReviewAction, status: ConfigurationStatus) =>
  new DomainError('conflict', 'invalid_transition', `A configuration that is ${STATUS_WORDS[status]} cannot be moved by "${ACTION_WORDS[action]}"`, {
    action,
    status,
    allowedFrom: TRANSITIONS[action].from,
  });

export class ConfigurationReview {
  constructor(
    private readonly orm: Orm,
    private readonly store: ConfigurationStore,
    private readonly engines: ConfigurationCompute,
    private readonly publicUrl: string,
    /** The sign-off and validation gates (review-gates.ts): checked before, recorded with the transition. */
    private readonly gates: Pick<ReviewGates, 'check'>,
  ) {}

  /**
   * Moves the configuration along the state machine. `expectRevision`
   * (optional) guards against deciding on a revision the caller did not see.
   * The transition row, the approval snapshot, the activity entry and the
   * mail outbox are written in one transaction.
   */
  async transition(
    teamId: string,
    id: string,
    actor: { id: string; roles: readonly Role[] },
    action: ReviewAction,
    o: { message?: string | undefined; expectRevision?: number | undefined; gate?: GateInput | undefined } = {},
  ): Promise<ConfigurationView> {
    const t = TRANSITIONS[action];
    const before = await this.store.get(teamId, id);
    if (!hasPermission(actor.roles, t.permission)) {
      throw new DomainError('forbidden', 'forbidden', `Your roles in this team do not allow this (needs ${t.permission})`, { permission: t.permission });
    }
    if (o.expectRevision !== undefined && o.expectRevision !== before.revision) throw staleRevision(o.expectRevision, before);
    if (!t.from.includes(before.status)) throw invalidTransition(action, before.status);
    if (t.decision && (await this.authored(actor.id, id, before.revision, this.orm))) {
      throw new DomainError('forbidden', 'own_revision', 'You authored this configuration or a revision it uses; another reviewer must decide', { action });
    }
    const gate = await this.gates.check(teamId, before, action, o.gate);
    // Approval freezes what the engines say now (computed before the transaction: it may take a moment).
    const snapshot = action === 'approve' ? await this.engines.inputs(before, before.revision) : undefined;
    const results = snapshot ? await this.engines.compute(snapshot.inputs) : undefined;
    return this.orm.transaction(async (tx) => {
      const [row] = await tx
        .update(configurations)
        .set({ status: t.to, updatedAt: sql`now()`, updatedBy: actor.id })
        .where(and(eq(configurations.id, id), eq(configurations.revision, before.revision), eq(configurations.status, before.status)))
        .returning({ id: configurations.id });
      if (!row) {
        const now = await this.store.get(teamId, id, tx);
        if (now.revision !== before.revision) throw staleRevision(before.revision, now);
        throw invalidTransition(action, now.status);
      }
      const [transitionRow] = await tx
        .insert(configurationTransitions)
        .values({ configurationId: id, revision: before.revision, fromStatus: before.status, toStatus: t.to, message: o.message ?? null, actorId: actor.id })
        .returning({ id: configurationTransitions.id });
      if (!transitionRow) throw new Error('insert returned nothing');
      await gate.record(tx, transitionRow.id, actor.id);
      if (snapshot && results) {
        await tx.insert(configurationApprovals).values({
          configurationId: id,
          revision: before.revision,
          engineVersion: ENGINE_VERSION,
          inputs: { refs: snapshot.refs, ...snapshot.inputs },
          results,
          message: o.message ?? null,
          approvedBy: actor.id,
        });
      }
      const after = await this.store.get(teamId, id, tx);
      await recordActivity(tx, {
        teamId,
        actorId: actor.id,
        action: `configuration.${action}`,
        subjectType: 'configuration',
        subjectId: id,
        summary: `Configuration "${after.name}" revision ${after.revision}: ${STATUS_WORDS[before.status]} → ${STATUS_WORDS[t.to]}${o.message ? ` (${o.message})` : ''}`,
      });
      await enqueueMail(tx, await this.reviewMails(tx, teamId, after, action, actor.id, o.message ?? null, transitionRow.id));
      return after;
    });
  }

  /**
   * True when the user authored any configuration revision of the current review round, or any
   * vehicle / design revision the current revision references. The round is every revision after
   * the last one a decision closed (approved or changes requested); with none, all of them. So a
   * reviewer who wrote revision 1 cannot approve once someone else has renamed it.
   */
  private async authored(userId: string, configurationId: string, revision: number, orm: Executor): Promise<boolean> {
    const r = await this.store.revisionRow(configurationId, revision, orm);
    if (r.authorId === userId) return true;
    const [closed] = await orm
      .select({ revision: sql<number | null>`max(${configurationTransitions.revision})` })
      .from(configurationTransitions)
      .where(
        and(
          eq(configurationTransitions.configurationId, configurationId),
          sql`${configurationTransitions.toStatus} IN ('approved', 'changes_requested')`,
          sql`${configurationTransitions.revision} < ${revision}`,
        ),
      );
    const [inRound] = await orm
      .select({ n: sql<number>`count(*)::int` })
      .from(configurationRevisions)
      .where(
        and(
          eq(configurationRevisions.configurationId, configurationId),
          eq(configurationRevisions.authorId, userId),
          sql`${configurationRevisions.revision} > ${closed?.revision ?? 0}`,
          sql`${configurationRevisions.revision} <= ${revision}`,
        ),
      );
    if ((inRound?.n ?? 0) > 0) return true;
    const [v] = await orm
      .select({ authorId: vehicleRevisions.authorId })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, r.vehicleId), eq(vehicleRevisions.revision, r.vehicleRevision)));
    if (v?.authorId === userId) return true;
    const designs = await orm
      .select({ authorId: axleDesignRevisions.authorId })
      .from(axleDesignRevisions)
      .where(
        or(
          and(eq(axleDesignRevisions.designId, r.frontDesignId), eq(axleDesignRevisions.revision, r.frontDesignRevision)),
          and(eq(axleDesignRevisions.designId, r.rearDesignId), eq(axleDesignRevisions.revision, r.rearDesignRevision)),
        ),
      );
    return designs.some((d) => d.authorId === userId);
  }

  /** Review requested → the team's reviewers; approved / changes requested → who submitted and who authored the revision. */
  private async reviewMails(
    tx: Executor,
    teamId: string,
    c: ConfigurationView,
    action: ReviewAction,
    actorId: string,
    message: string | null,
    transitionId: string,
  ): Promise<OutgoingMail[]> {
    if (action !== 'submit' && action !== 'approve' && action !== 'request-changes') return [];
    const [team] = await tx.select({ name: teams.name }).from(teams).where(eq(teams.id, teamId));
    const [actor] = await tx.select({ name: users.displayName }).from(users).where(eq(users.id, actorId));
    const link = `${this.publicUrl}/teams/${teamId}/configurations/${c.id}`;
    const base = { teamName: team?.name ?? '', configurationName: c.name, revision: c.revision, link, message };
    let recipients: { id: string; email: string }[];
    if (action === 'submit') {
      recipients = await tx
        .select({ id: users.id, email: users.email })
        .from(memberships)
        .innerJoin(users, eq(users.id, memberships.userId))
        .where(and(eq(memberships.teamId, teamId), sql`'reviewer' = ANY(${memberships.roles})`));
    } else {
      const rev = await this.store.revisionRow(c.id, c.revision, tx);
      const submitters = await tx
        .select({ actorId: configurationTransitions.actorId })
        .from(configurationTransitions)
        .where(and(eq(configurationTransitions.configurationId, c.id), eq(configurationTransitions.revision, c.revision), eq(configurationTransitions.toStatus, 'in_review')));
      const ids = [...new Set([rev.authorId, ...submitters.map((x) => x.actorId)].filter((x): x is string => !!x))];
      recipients = ids.length
        ? await tx
            .select({ id: users.id, email: users.email })
            .from(users)
            .where(sql`${users.id} IN (${sql.join(ids.map((x) => sql`${x}`), sql`, `)})`)
        : [];
    }
    const text =
      action === 'submit'
        ? mailText.reviewRequested({ ...base, submitterName: actor?.name ?? 'Someone' })
        : mailText.decisionMade({ ...base, deciderName: actor?.name ?? 'A reviewer', decision: STATUS_WORDS[TRANSITIONS[action].to] });
    return recipients
      .filter((r) => r.id !== actorId)
      .map((r) => ({ kind: action === 'submit' ? 'review-requested' : 'decision-made', to: r.email, teamId, ...text, dedupeKey: `transition:${transitionId}:${r.id}` }));
  }
}
