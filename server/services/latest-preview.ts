/**
 * "Use the latest revisions", previewed: what re-pointing a configuration at
 * the current revisions of its vehicle and both axle designs would change,
 * inputs value by value and key results old → new, computed now by the
 * engines. Nothing is stored; saving is the ordinary new revision
 * (`PUT …/configurations/:id`) with the revisions shown here.
 */
import { and, eq } from 'drizzle-orm';
import type { Orm } from '../db/client.js';
import { axleDesignRevisions, axleDesigns, vehicleRevisions, vehicles } from '../db/schema.js';
import { DomainError } from '../../shared/errors.js';
import { ENGINE_VERSION } from '../../shared/version.js';
import { storedCorner } from './axle-designs.js';
import { upgradeVehicleDocument } from '../../shared/schema/vehicle.js';
import { diffDocuments } from './document-diff.js';
import { diffResults, type ConfigurationInputs, type ConfigurationRefs, type Configurations } from './configurations.js';

export class LatestPreview {
  constructor(
    private readonly orm: Orm,
    private readonly configs: Configurations,
  ) {}

  /** The current revision of the vehicle and of each design the configuration uses. */
  private async latestRefs(refs: ConfigurationRefs): Promise<ConfigurationRefs> {
    const [v] = await this.orm.select({ revision: vehicles.revision }).from(vehicles).where(eq(vehicles.id, refs.vehicleId));
    const design = async (id: string) => (await this.orm.select({ revision: axleDesigns.revision }).from(axleDesigns).where(eq(axleDesigns.id, id)))[0]!.revision;
    return { ...refs, vehicleRevision: v!.revision, frontDesignRevision: await design(refs.frontDesignId), rearDesignRevision: await design(refs.rearDesignId) };
  }

  private async documents(refs: ConfigurationRefs): Promise<ConfigurationInputs> {
    const [v] = await this.orm
      .select({ data: vehicleRevisions.data })
      .from(vehicleRevisions)
      .where(and(eq(vehicleRevisions.vehicleId, refs.vehicleId), eq(vehicleRevisions.revision, refs.vehicleRevision)));
    if (!v || v.data === null) {
      throw new DomainError('conflict', 'incomplete_configuration', `The vehicle's latest revision (${refs.vehicleRevision}) has no vehicle data yet; enter the balance model data first`, {
        field: 'vehicleRevision',
      });
    }
    const corner = async (designId: string, revision: number) => {
      const [d] = await this.orm
        .select({ corner: axleDesignRevisions.corner })
        .from(axleDesignRevisions)
        .where(and(eq(axleDesignRevisions.designId, designId), eq(axleDesignRevisions.revision, revision)));
      return storedCorner(d!.corner);
    };
    return {
      vehicle: upgradeVehicleDocument(v.data),
      frontCorner: await corner(refs.frontDesignId, refs.frontDesignRevision),
      rearCorner: await corner(refs.rearDesignId, refs.rearDesignRevision),
      trackProfile: refs.trackProfile,
    };
  }

  /** `c`: the configuration as loaded for its team. */
  async preview(c: { id: string; revision: number }) {
    const current = await this.configs.inputs(c);
    const latest = await this.latestRefs(current.refs);
    const changedRefs = (['vehicleRevision', 'frontDesignRevision', 'rearDesignRevision'] as const)
      .filter((k) => current.refs[k] !== latest[k])
      .map((k) => ({ ref: k, from: current.refs[k], to: latest[k] }));
    const base = { engineVersion: ENGINE_VERSION, revision: current.revision, current: current.refs, latest, changedRefs };
    if (!changedRefs.length) return { ...base, upToDate: true, inputs: [], results: [] };
    const latestInputs = await this.documents(latest);
    const [a, b] = await Promise.all([this.configs.compute(current.inputs), this.configs.compute(latestInputs)]);
    return {
      ...base,
      upToDate: false,
      inputs: diffDocuments(current.inputs, latestInputs, { expandArrays: true }),
      results: diffResults(a, b),
    };
  }
}
