import { computed, effect, inject, Injectable, signal, untracked, type Signal } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { catchError, firstValueFrom, forkJoin, of } from 'rxjs';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import { apiProblem } from '../../core/http/api-error';
import { loadState } from '../../core/http/load-state';
import { TeamAccess } from '../../core/teams/team-access';
import { AxleDesign, FeaturesApi, Proposal, RevisionRow } from '../features-api';
import { EditHistory } from './edit-history';
import { changedSettings, settingRow, withSetting, withSettingsFrom, type SettingKind, type SettingValue } from './corner-settings-model';
import { changedPoints, getPoint, pointName, withPoint, withPoints } from './hardpoint-model';

/** Which design the editor shows (the route's parameters). */
export interface DesignRoute {
  readonly teamId: string;
  readonly vehicleId: string;
  readonly designId: string;
}

/** One point or setting where two versions differ: its name, what it measures, and the numbers of each (stored units). */
export interface ConflictRow {
  readonly key: string;
  readonly name: string;
  readonly kind: SettingKind;
  /** Numbers in stored units, or words for a choice; undefined where that version lacks it (a rate: rigid). */
  readonly theirs: readonly number[] | string | undefined;
  readonly yours: readonly number[] | string | undefined;
}

/** Someone else saved first: their revision, and each point or setting where it differs from ours. */
export interface SaveConflict {
  readonly theirs: AxleDesign;
  readonly rows: readonly ConflictRow[];
}

/**
 * The axle-design editor's state, scoped to one editor page (provided in
 * its `providers`): the design as loaded and saved, the corner being edited
 * with its undo history, the revision list, open proposals, and the save with
 * its conflict. The page binds the route with `follow()`; a new design id
 * loads the new design and starts a fresh history.
 */
@Injectable()
export class AxleDesignStore {
  private readonly api = inject(FeaturesApi);
  private readonly access = inject(TeamAccess);

  private readonly routeSource = signal<Signal<DesignRoute> | null>(null);
  /** The design on screen, or undefined before the page binds its route. */
  readonly route = computed(() => this.routeSource()?.());

  private readonly loaded = rxResource({
    params: () => this.route(),
    stream: ({ params: r }) =>
      forkJoin({
        design: this.api.axleDesign(r.teamId, r.designId),
        // The cautions use the vehicle's tyres and loads where it can be read; without it they use the product defaults.
        vehicle: this.api.vehicle(r.teamId, r.vehicleId).pipe(catchError(() => of(null))),
        team: this.access.load(r.teamId),
      }),
  });
  /** Loading, ready or the reason the design could not be loaded. */
  readonly state = loadState(this.loaded);
  /** The vehicle's data for the cautions (null where it could not be read). */
  readonly vehicleData = computed<unknown>(() => (this.loaded.hasValue() ? (this.loaded.value().vehicle?.data ?? null) : null));

  private readonly revisionList = rxResource({
    params: () => this.route(),
    stream: ({ params: r }) => this.api.axleDesignRevisions(r.teamId, r.designId).pipe(catchError(() => of([] as RevisionRow[]))),
  });
  readonly revisions = computed<readonly RevisionRow[]>(() => (this.revisionList.hasValue() ? this.revisionList.value() : []));

  private readonly proposalList = rxResource({
    params: () => this.route(),
    stream: ({ params: r }) => this.api.proposals(r.teamId, r.designId).pipe(catchError(() => of([] as Proposal[]))),
  });
  readonly proposals = computed<readonly Proposal[]>(() => (this.proposalList.hasValue() ? this.proposalList.value() : []));
  readonly openProposals = computed(() => this.proposals().filter((p) => p.status === 'open'));

  /** The revision the edits started from (the latest one loaded or saved). */
  readonly saved = signal<AxleDesign | null>(null);
  /** Undo / redo over the corner being edited; null until a design is loaded. */
  readonly history = new EditHistory<Corner | null>(null);
  readonly corner = this.history.present;
  readonly canUndo = this.history.canUndo;
  readonly canRedo = this.history.canRedo;
  readonly changed = computed(() => {
    const c = this.corner();
    const s = this.saved();
    return c && s ? [...changedPoints(c, s.corner), ...changedSettings(c, s.corner)] : [];
  });
  readonly dirty = computed(() => this.changed().length > 0);

  readonly saving = signal(false);
  readonly saveError = signal<string | null>(null);
  readonly notice = signal<string | null>(null);
  readonly conflict = signal<SaveConflict | null>(null);
  readonly deciding = signal(false);
  readonly proposalError = signal<string | null>(null);

  constructor() {
    // A newly loaded design (first visit or another id) becomes the start of a fresh history.
    effect(() => {
      if (!this.loaded.hasValue()) return;
      const design = this.loaded.value().design;
      untracked(() => this.adopt(design));
    });
  }

  /** Binds the store to the page's route parameters (route inputs). */
  follow(route: Signal<DesignRoute>): void {
    this.routeSource.set(route);
  }

  reload(): void {
    this.loaded.reload();
  }

  private adopt(design: AxleDesign): void {
    this.saved.set(design);
    this.history.reset(design.corner);
    this.conflict.set(null);
  }

  private refreshLists(): void {
    this.revisionList.reload();
    this.proposalList.reload();
  }

  // ---- editing ----

  /** Moves one point; a new undo step. */
  editPoint(key: string, value: Vec3): void {
    const c = this.corner();
    if (!c) return;
    this.history.commit(withPoint(c, key, value));
    this.notice.set(null);
  }

  /**
   * Changes one setting that is not a point (wheel radius, a stroke end, an axis component, what a part rides on,
   * the toe link, steered, a compliance rate; undefined makes a rate rigid again); a new undo step.
   */
  editSetting(path: string, index: number | null, value: SettingValue): void {
    const c = this.corner();
    if (!c) return;
    this.history.commit(withSetting(c, path, index, value));
    this.notice.set(null);
  }

  /** Puts back the saved revision's settings that are not points (wheel radius, strokes, axes, choices, rates); one undo step, the points kept. */
  restoreSettings(): void {
    const c = this.corner();
    const s = this.saved();
    if (!c || !s || changedSettings(c, s.corner).length === 0) return;
    this.history.commit(withSettingsFrom(c, s.corner));
    this.notice.set(null);
  }

  /** Moves several points at once (a paste or an import); one undo step. */
  editPoints(points: ReadonlyMap<string, Vec3>): void {
    const c = this.corner();
    if (!c) return;
    this.history.commit(withPoints(c, points));
    this.notice.set(null);
  }

  undo(): void {
    this.history.undo();
  }

  redo(): void {
    this.history.redo();
  }

  // ---- saving ----

  /** Saves the edited corner as a new revision over the one the edits started from. */
  async save(message: string): Promise<boolean> {
    const c = this.corner();
    const s = this.saved();
    if (!c || !s || this.saving()) return false;
    return this.saveOver(c, s.revision, message);
  }

  private async saveOver(corner: Corner, baseRevision: number, message: string): Promise<boolean> {
    const r = this.route();
    if (!r) return false;
    this.saving.set(true);
    this.saveError.set(null);
    try {
      const result = await firstValueFrom(this.api.saveCorner(r.teamId, r.designId, corner, baseRevision, message.trim() || undefined));
      this.saved.set(result);
      this.conflict.set(null);
      this.notice.set(`Saved as revision ${result.revision}.`);
      this.refreshLists();
      return true;
    } catch (error) {
      const problem = apiProblem(error);
      if (problem.status === 409) await this.showConflict(r, problem.details);
      else this.saveError.set(problem.message);
      return false;
    } finally {
      this.saving.set(false);
    }
  }

  private async showConflict(r: DesignRoute, details: unknown): Promise<void> {
    let theirs: AxleDesign | null = null;
    const current = (details as { current?: unknown } | undefined)?.current;
    if (current && typeof current === 'object' && 'corner' in current && 'revision' in current) theirs = current as AxleDesign;
    if (!theirs) {
      try {
        theirs = await firstValueFrom(this.api.axleDesign(r.teamId, r.designId));
      } catch (error) {
        this.saveError.set(`Someone else saved first, and their version could not be loaded: ${apiProblem(error).message}`);
        return;
      }
    }
    const yours = this.corner();
    if (!yours) return;
    const keys = [...new Set([...changedPoints(yours, theirs.corner), ...changedPoints(theirs.corner, yours)])];
    const settings = [...new Set([...changedSettings(yours, theirs.corner), ...changedSettings(theirs.corner, yours)])];
    const other = theirs;
    this.conflict.set({
      theirs: other,
      rows: [
        ...keys.map((key): ConflictRow => ({ key, name: pointName(key, yours), kind: 'length', theirs: getPoint(other.corner, key), yours: getPoint(yours, key) })),
        ...settings.map((key): ConflictRow => {
          const mine = settingRow(yours, key);
          return { key, name: mine.name, kind: mine.kind, theirs: settingRow(other.corner, key).value, yours: mine.value };
        }),
      ],
    });
  }

  /** Conflict: saves ours over their revision. */
  async keepMine(message: string): Promise<boolean> {
    const conflict = this.conflict();
    const c = this.corner();
    if (!conflict || !c) return false;
    return this.saveOver(c, conflict.theirs.revision, message);
  }

  /** Conflict: continues from their revision; ours stays one undo step back. */
  takeTheirs(): void {
    const conflict = this.conflict();
    if (!conflict) return;
    this.saved.set(conflict.theirs);
    this.history.commit(conflict.theirs.corner);
    this.conflict.set(null);
    this.notice.set(`Showing revision ${conflict.theirs.revision}; your version is one undo step back.`);
    this.refreshLists();
  }

  // ---- proposals ----

  /** Accepts (a new revision from the proposed corner) or rejects an engineer's proposal. */
  async decide(proposal: Proposal, decision: 'accept' | 'reject'): Promise<void> {
    const r = this.route();
    if (!r || this.deciding() || (decision === 'accept' && this.dirty())) return;
    this.deciding.set(true);
    this.proposalError.set(null);
    try {
      await firstValueFrom(this.api.decideProposal(r.teamId, r.designId, proposal.id, decision));
      const design = await firstValueFrom(this.api.axleDesign(r.teamId, r.designId));
      if (decision === 'accept') {
        this.adopt(design);
        this.notice.set(`Accepted the proposal from ${proposal.authorName ?? 'an engineer'}: now revision ${design.revision}.`);
      } else {
        this.notice.set('Proposal rejected; the design is unchanged.');
      }
      this.refreshLists();
    } catch (error) {
      this.proposalError.set(apiProblem(error).message);
    } finally {
      this.deciding.set(false);
    }
  }
}
