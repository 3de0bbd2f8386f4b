/**
 * Response types of the studies API (docs/api.md, "Studies"), as they travel:
 * timestamps are ISO 8601 UTC strings. The server's handlers are checked
 * against them (server/http/reply.ts) and the app's data access reads them;
 * framework-free types only.
 */
import type { AxleName } from '../schema/axle.js';
import type { StudyKeyFigure } from '../study/key-figures.js';
import type { StudyResult } from '../study/run.js';

export type StudyStatus = 'queued' | 'running' | 'completed' | 'failed' | 'cancelled';
export type StudyKind = 'tolerance' | 'sweep';

/**
 * The target a study ran on, its revision resolved: an axle design, or one
 * axle of a configuration. For a configuration, `revision` is the design
 * revision of that axle (a sweep's variants are proposed on it), and the
 * configuration's own revision is not kept.
 */
export type StudyResolvedTarget =
  | { readonly axleDesignId: string; readonly designId: string; readonly revision: number; readonly axle: AxleName }
  | { readonly configurationId: string; readonly revision: number; readonly axle: AxleName; readonly designId: string; readonly designRevision: number };

/** Why a study failed or was lost (`code` as in the error shape). */
export interface StudyError {
  readonly code: string;
  readonly message: string;
}

/** `StudyView` of docs/api.md ("Studies"). */
export interface StudyView {
  readonly id: string;
  readonly kind: StudyKind;
  readonly label: string;
  readonly status: StudyStatus;
  readonly progress: { readonly doneChunks: number; readonly totalChunks: number; readonly doneSamples: number; readonly totalSamples: number };
  /** From the measured chunk rate since the first chunk started; null until a chunk is done. */
  readonly etaSeconds: number | null;
  readonly error: StudyError | null;
  readonly target: StudyResolvedTarget;
  readonly seed: number;
  readonly createdAt: string;
  readonly startedAt: string | null;
  readonly finishedAt: string | null;
  readonly createdBy: { readonly id: string; readonly displayName: string } | null;
  /** Once completed (the list leaves it out). */
  readonly result?: StudyResult;
}

/** `AttachedStudy` of docs/api.md: a completed study on a configuration's review record, with its key figures. */
export interface AttachedStudy {
  readonly studyId: string;
  readonly configurationId: string;
  readonly label: string;
  readonly kind: StudyKind;
  readonly totalSamples: number;
  readonly note: string;
  readonly attachedAt: string;
  readonly attachedBy: { readonly id: string; readonly displayName: string } | null;
  readonly keyFigures: readonly StudyKeyFigure[];
}

/** `GET /api/programmes/:programmeId/studies`: per accepted team, its latest attached study. */
export interface ProgrammeStudies {
  readonly programmeId: string;
  readonly teams: readonly { readonly teamId: string; readonly teamName: string; readonly configurationName: string | null; readonly study: AttachedStudy | null }[];
}
