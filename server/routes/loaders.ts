/**
 * `router.param` loaders: the document a path names (`:vehicleId`,
 * `:designId`, `:configurationId`, `:proposalId`, `:approvalId`,
 * `:measurementId`, `:studyId`, and `:programmeId` for its instructor),
 * loaded once per request, checked to belong to the path's team (and
 * parent), typed.
 *
 *   r.param('vehicleId', loadParam('vehicle', 'Vehicle', (req, id) => vehicles.get(currentAccess(req).teamId, id)));
 *   r.get('/:vehicleId/revisions', requirePermission('team:read'), async (req, res) => {
 *     res.json(await vehicles.revisions(await loaded(req, 'vehicle')));
 *   });
 *
 * Express runs param callbacks before a route's own middleware, so the load
 * is lazy: the callback only registers it, and it runs when the handler asks,
 * after `requirePermission` has checked the caller and the team. An
 * anonymous caller or a non-member so learns nothing about whether the id
 * exists; a malformed id is a plain 404 like an unknown one.
 */
import type { Request, RequestHandler, RequestParamHandler } from 'express';
import { notFound } from '../../shared/errors.js';
import { isUuid } from '../http/authorize.js';
import type { VehicleView } from '../services/vehicles.js';
import type { AxleDesignView } from '../services/axle-designs.js';
import type { ProposalView } from '../services/proposals.js';
import type { ConfigurationView, Configurations } from '../services/configurations.js';
import type { RigMeasurementSummary } from '../services/rig-measurements.js';
import type { StudyRow } from '../services/studies.js';
import type { ProgrammeRow } from '../services/programmes.js';

/** What each loader puts on the request. */
export interface Loaded {
  vehicle: VehicleView;
  design: AxleDesignView;
  configuration: ConfigurationView;
  proposal: ProposalView;
  rigMeasurement: RigMeasurementSummary;
  study: StudyRow;
  programme: ProgrammeRow;
  /** An approval's frozen snapshot beside the current engine's recompute (of the path's configuration). */
  approval: Awaited<ReturnType<Configurations['approval']>>;
}

type Loaders = { [K in keyof Loaded]?: () => Promise<Loaded[K]> };

declare global {
  // eslint-disable-next-line @typescript-eslint/no-namespace
  namespace Express {
    interface Request {
      loaders?: Loaders;
    }
  }
}

/** A `router.param` callback registering the lazy, memoised load of `key` from the path's id. */
export function loadParam<K extends keyof Loaded>(key: K, what: string, load: (req: Request, id: string) => Promise<Loaded[K]>): RequestParamHandler {
  return (req, _res, next, raw: unknown) => {
    let loading: Promise<Loaded[K]> | undefined;
    const loader = (): Promise<Loaded[K]> => (loading ??= isUuid(raw) ? load(req, raw) : Promise.reject(notFound(what)));
    (req.loaders ??= {})[key] = loader as Loaders[K];
    next();
  };
}

/** The same loader for a parameter of the path the router is mounted at (`mergeParams`), where `router.param` does not fire. */
export function loadParentParam(name: string, handler: RequestParamHandler): RequestHandler {
  return (req, res, next) => handler(req, res, next, req.params[name], name);
}

/** The document the path names (404 when it is not there or not the team's). */
export function loaded<K extends keyof Loaded>(req: Request, key: K): Promise<Loaded[K]> {
  const load = req.loaders?.[key] as (() => Promise<Loaded[K]>) | undefined;
  if (!load) throw new Error(`route has no ${key} loader`);
  return load();
}
