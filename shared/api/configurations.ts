/**
 * Response types of the configurations and review API (docs/api.md,
 * "Configurations and review"), as they travel: timestamps are ISO 8601 UTC
 * strings. The server's handlers are checked against them (server/http/send.ts)
 * and the app's data access reads them; framework-free types only.
 */
import type { BalanceResponse } from '../balance/api.js';
import type { AxleName } from '../schema/axle.js';
import type { ToeFit } from '../kinematics/fit.js';
import type { Corner } from '../schema/corner.js';
import type { TrackProfileId } from '../tracks/profiles.js';
import type { Difference } from './common.js';

/** `status` of a configuration (docs/workflow.md). */
export type ConfigurationStatus = 'draft' | 'in_review' | 'approved' | 'changes_requested' | 'released' | 'validated';

/** The review steps of the state machine (POST …/configurations/:id/<action>). */
export type ReviewAction = 'submit' | 'withdraw' | 'approve' | 'request-changes' | 'release' | 'validate';

/** `Configuration` of docs/api.md. */
export interface Configuration {
  readonly id: string;
  readonly name: string;
  readonly status: ConfigurationStatus;
  readonly revision: number;
  readonly archived: boolean;
  readonly vehicle: { readonly id: string; readonly name: string; readonly revision: number };
  readonly front: { readonly designId: string; readonly name: string; readonly revision: number };
  readonly rear: { readonly designId: string; readonly name: string; readonly revision: number };
  readonly trackProfile: TrackProfileId;
  readonly updatedAt: string;
  readonly updatedByName: string | null;
  readonly createdAt: string;
}

export interface ConfigurationRefs {
  readonly vehicleId: string;
  readonly vehicleRevision: number;
  readonly frontDesignId: string;
  readonly frontDesignRevision: number;
  readonly rearDesignId: string;
  readonly rearDesignRevision: number;
  readonly trackProfile: TrackProfileId;
}

export interface ConfigurationRevision extends ConfigurationRefs {
  readonly revision: number;
  readonly name: string;
  readonly message: string | null;
  readonly authorName: string | null;
  readonly createdAt: string;
}

export interface TransitionRow {
  readonly revision: number;
  readonly fromStatus: ConfigurationStatus;
  readonly toStatus: ConfigurationStatus;
  readonly message: string | null;
  readonly actorName: string | null;
  readonly createdAt: string;
}

/** The documents a configuration revision stands for. */
export interface ConfigurationInputs {
  readonly vehicle: unknown;
  readonly frontCorner: Corner;
  readonly rearCorner: Corner;
  readonly trackProfile: TrackProfileId;
}

/** What an approval froze: the inputs and the references they came from. */
export interface FrozenInputs extends ConfigurationInputs {
  readonly refs: ConfigurationRefs;
}

/** What the engines compute for a configuration (the balance with both corners linked; each corner's fit over the profile's travel). */
export interface ConfigurationResults {
  readonly balance: BalanceResponse;
  readonly bumpSteer: { readonly front: ToeFit; readonly rear: ToeFit; readonly travelMm: readonly [number, number] };
}

export interface ResultsAnswer {
  readonly revision: number;
  readonly refs: ConfigurationRefs;
  readonly engineVersion: string;
  readonly results: ConfigurationResults;
}

export interface ApprovalSummary {
  readonly id: string;
  readonly revision: number;
  readonly engineVersion: string;
  readonly message: string | null;
  readonly approvedByName: string | null;
  readonly approvedAt: string;
}

export interface ApprovalDetail extends ApprovalSummary {
  readonly inputs: FrozenInputs;
  readonly results: ConfigurationResults;
  readonly recompute:
    | { readonly engineVersion: string; readonly differences: readonly Difference[] }
    | { readonly engineVersion: string; readonly error: { readonly code: string; readonly message: string } };
}

export interface CompareAnswer {
  readonly engineVersion: string;
  readonly a: { readonly configurationId: string; readonly revision: number; readonly refs: ConfigurationRefs };
  readonly b: { readonly configurationId: string; readonly revision: number; readonly refs: ConfigurationRefs };
  readonly inputs: readonly Difference[];
  readonly results: readonly Difference[];
}

export interface ReviewComment {
  readonly id: string;
  readonly revision: number;
  readonly parentId: string | null;
  readonly resultRef: string | null;
  readonly body: string;
  readonly authorName: string | null;
  readonly createdAt: string;
  readonly resolvedAt: string | null;
}

export interface CommentThread extends ReviewComment {
  readonly resolved: boolean;
  readonly replies: readonly ReviewComment[];
}

/** The answer of posting a comment or resolving / reopening a thread: the stored comment (`resolved` on threads). */
export interface StoredComment {
  readonly id: string;
  readonly configurationId: string;
  readonly revision: number;
  readonly parentId: string | null;
  readonly resultRef: string | null;
  readonly body: string;
  readonly authorId: string | null;
  readonly createdAt: string;
  readonly resolvedAt: string | null;
  readonly resolvedBy: string | null;
}

/** One Critical item a sign-off must acknowledge (an axle whose cautions could not be measured counts as one). */
export interface CriticalCaution {
  readonly axle: AxleName;
  readonly code: string;
  readonly message: string;
  readonly value: number | null;
  readonly threshold: number | null;
  readonly unit: string | null;
}

/** A rig measurement of an axle design revision a configuration uses, compared now with the team's tolerance. */
export interface RigEvidence {
  readonly id: string;
  readonly name: string;
  readonly authorName: string | null;
  readonly createdAt: string;
  readonly toeLargestDeg: number;
  readonly camberLargestDeg: number | null;
  readonly within: boolean;
}

/** The rig evidence of one axle; `satisfied` when at least one measurement is within the tolerance. */
export interface AxleEvidence {
  readonly axle: AxleName;
  readonly designRevision: number;
  readonly measurements: readonly RigEvidence[];
  readonly satisfied: boolean;
}

/** GET …/configurations/:id/gates: what a sign-off and the move to validated ask for now. */
export interface GatesAnswer {
  readonly revision: number;
  readonly critical: readonly CriticalCaution[];
  readonly rig: {
    readonly tolerance: { readonly toeDeg: number; readonly camberDeg: number; readonly isDefault: boolean };
    readonly axles: readonly AxleEvidence[];
  };
  readonly acknowledgements: readonly { readonly axle: AxleName; readonly code: string; readonly reason: string; readonly acknowledgedByName: string | null }[];
  readonly waivers: readonly { readonly axle: AxleName; readonly reason: string; readonly waivedByName: string | null }[];
}

/** GET …/configurations/:id/latest-preview: what moving to the latest vehicle and design revisions would change (nothing is saved). */
export interface LatestPreviewAnswer {
  readonly engineVersion: string;
  readonly revision: number;
  readonly current: ConfigurationRefs;
  readonly latest: ConfigurationRefs;
  readonly changedRefs: readonly { readonly ref: 'vehicleRevision' | 'frontDesignRevision' | 'rearDesignRevision'; readonly from: number; readonly to: number }[];
  readonly upToDate: boolean;
  readonly inputs: readonly Difference[];
  readonly results: readonly Difference[];
}
