/**
 * Approvals of configurations: the inputs, results and engine version frozen
 * when a reviewer approved (written by configurations/review.ts), read back
 * and recomputed by today's engine beside them. Each method takes the
 * configuration as loaded for its team (routes/loaders.ts).
 */
import { and, desc, eq } from 'drizzle-orm';
import type { Orm } from '../../db/client.js';
import { configurationApprovals, users } from '../../db/schema.js';
import { notFound } from '../../../shared/errors.js';
import { ENGINE_VERSION } from '../../../shared/version.js';
import type { ConfigurationResults } from '../../../shared/api/configurations.js';
import type { Difference } from '../document-diff.js';
import { diffResults, type ConfigurationCompute } from './compute.js';

export class ConfigurationApprovals {
  constructor(
    private readonly orm: Orm,
    private readonly engines: ConfigurationCompute,
  ) {}

  /** The configuration's approvals, newest first (`c` as the team's). */
  async approvals(c: { id: string }) {
    return this.orm
      .select({
        id: configurationApprovals.id,
        revision: configurationApprovals.revision,
        engineVersion: configurationApprovals.engineVersion,
        message: configurationApprovals.message,
        approvedByName: users.displayName,
        approvedAt: configurationApprovals.approvedAt,
      })
      .from(configurationApprovals)
      .leftJoin(users, eq(users.id, configurationApprovals.approvedBy))
      .where(eq(configurationApprovals.configurationId, c.id))
      .orderBy(desc(configurationApprovals.approvedAt));
  }

  /** An approval's frozen inputs' track profile and results, as stored. */
  async frozen(c: { id: string }, approvalId: string): Promise<{ trackProfile: string; results: ConfigurationResults }> {
    const [a] = await this.orm
      .select({ inputs: configurationApprovals.inputs, results: configurationApprovals.results })
      .from(configurationApprovals)
      .where(and(eq(configurationApprovals.id, approvalId), eq(configurationApprovals.configurationId, c.id)));
    if (!a) throw notFound('Approval');
    return { trackProfile: a.inputs.trackProfile, results: a.results };
  }

  /** The frozen snapshot as approved, and beside it what the current engine computes from the same frozen inputs. */
  async approval(c: { id: string }, approvalId: string) {
    const [a] = await this.orm
      .select({
        id: configurationApprovals.id,
        revision: configurationApprovals.revision,
        engineVersion: configurationApprovals.engineVersion,
        inputs: configurationApprovals.inputs,
        results: configurationApprovals.results,
        message: configurationApprovals.message,
        approvedByName: users.displayName,
        approvedAt: configurationApprovals.approvedAt,
      })
      .from(configurationApprovals)
      .leftJoin(users, eq(users.id, configurationApprovals.approvedBy))
      .where(and(eq(configurationApprovals.id, approvalId), eq(configurationApprovals.configurationId, c.id)));
    if (!a) throw notFound('Approval');
    const frozen = a.inputs;
    let recompute: { engineVersion: string; differences: Difference[] } | { engineVersion: string; error: { code: string; message: string } };
    try {
      const now = await this.engines.compute({ vehicle: frozen.vehicle, frontCorner: frozen.frontCorner, rearCorner: frozen.rearCorner, trackProfile: frozen.trackProfile });
      recompute = { engineVersion: ENGINE_VERSION, differences: diffResults(a.results, now) };
    } catch (err) {
      // An engine that can no longer compute the frozen inputs is itself a difference worth showing.
      const e = err as { code?: string; message?: string };
      recompute = { engineVersion: ENGINE_VERSION, error: { code: e.code ?? 'recompute_failed', message: e.message ?? 'The current engine could not recompute this snapshot' } };
    }
    return { ...a, recompute };
  }
}
