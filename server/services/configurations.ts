/**
 * Configurations: one vehicle revision + one front and one rear axle design
 * revision + a track profile, the unit of review. The parts live in
 * configurations/: store.ts (reading, creating, revising; revisions and
 * history), compute.ts (a revision's inputs and what the engines make of
 * them), review.ts (the review state machine), approvals.ts (frozen
 * snapshots) and comments.ts (review threads). `Configurations` is the one
 * object routes and other services hold; each method hands over to its part.
 * Methods taking `c` expect the configuration as loaded for its team
 * (routes/loaders.ts); the others check the team themselves.
 */
import type { Executor, Orm } from '../db/client.js';
import type { ComputePool } from '../compute/pool.js';
import type { Role } from '../permissions.js';
import { ConfigurationStore, type ConfigurationChange, type ConfigurationView, type RefsInput } from './configurations/store.js';
import { ConfigurationCompute, type ConfigurationInputs } from './configurations/compute.js';
import { ConfigurationReview, type ReviewAction } from './configurations/review.js';
import { ConfigurationApprovals } from './configurations/approvals.js';
import { ConfigurationComments } from './configurations/comments.js';
import { ReviewGates, type GateInput } from './review-gates.js';

export type { ConfigurationChange, ConfigurationRefs, ConfigurationView, RefsInput } from './configurations/store.js';
export { diffResults, type ConfigurationInputs, type ConfigurationResults } from './configurations/compute.js';
export { TRANSITIONS, type ReviewAction } from './configurations/review.js';

export class Configurations {
  private readonly store: ConfigurationStore;
  private readonly engines: ConfigurationCompute;
  private readonly review: ConfigurationReview;
  private readonly snapshots: ConfigurationApprovals;
  private readonly threads: ConfigurationComments;

  constructor(orm: Orm, pool: ComputePool, computeTimeLimitMs: number, publicUrl: string) {
    this.store = new ConfigurationStore(orm);
    this.engines = new ConfigurationCompute(orm, this.store, pool, computeTimeLimitMs);
    this.review = new ConfigurationReview(orm, this.store, this.engines, publicUrl, new ReviewGates(orm, this, pool, computeTimeLimitMs));
    this.snapshots = new ConfigurationApprovals(orm, this.engines);
    this.threads = new ConfigurationComments(orm);
  }

  // ---- store.ts: reading, creating, revising -------------------------------------
  list(teamId: string, includeArchived: boolean) {
    return this.store.list(teamId, includeArchived);
  }
  get(teamId: string, id: string, orm?: Executor): Promise<ConfigurationView> {
    return this.store.get(teamId, id, orm);
  }
  create(teamId: string, authorId: string, input: RefsInput & { name: string; message?: string | undefined }) {
    return this.store.create(teamId, authorId, input);
  }
  revise(teamId: string, id: string, authorId: string, baseRevision: number, change: ConfigurationChange) {
    return this.store.revise(teamId, id, authorId, baseRevision, change);
  }
  setArchived(teamId: string, c: { id: string }, userId: string, archived: boolean) {
    return this.store.setArchived(teamId, c, userId, archived);
  }
  revisions(c: { id: string }) {
    return this.store.revisions(c);
  }
  history(c: { id: string }) {
    return this.store.history(c);
  }

  // ---- compute.ts: inputs and results --------------------------------------------
  inputs(c: { id: string; revision: number }, revision?: number) {
    return this.engines.inputs(c, revision);
  }
  compute(inputs: ConfigurationInputs) {
    return this.engines.compute(inputs);
  }
  results(c: { id: string; revision: number }, revision?: number) {
    return this.engines.results(c, revision);
  }
  compare(teamId: string, a: { id: string; revision?: number | undefined }, b: { id: string; revision?: number | undefined }) {
    return this.engines.compare(teamId, a, b);
  }

  // ---- review.ts: the state machine ----------------------------------------------
  transition(
    teamId: string,
    id: string,
    actor: { id: string; roles: readonly Role[] },
    action: ReviewAction,
    o: { message?: string | undefined; expectRevision?: number | undefined; gate?: GateInput | undefined } = {},
  ): Promise<ConfigurationView> {
    return this.review.transition(teamId, id, actor, action, o);
  }

  // ---- approvals.ts: frozen snapshots --------------------------------------------
  approvals(c: { id: string }) {
    return this.snapshots.approvals(c);
  }
  approval(c: { id: string }, approvalId: string) {
    return this.snapshots.approval(c, approvalId);
  }
  frozen(c: { id: string }, approvalId: string) {
    return this.snapshots.frozen(c, approvalId);
  }

  // ---- comments.ts: review threads -----------------------------------------------
  comments(c: { id: string }) {
    return this.threads.comments(c);
  }
  addComment(teamId: string, c: ConfigurationView, authorId: string, input: { body: string; resultRef?: string | undefined; parentId?: string | undefined }) {
    return this.threads.addComment(teamId, c, authorId, input);
  }
  resolveThread(c: { id: string }, commentId: string, userId: string, resolved: boolean) {
    return this.threads.resolveThread(c, commentId, userId, resolved);
  }
}
