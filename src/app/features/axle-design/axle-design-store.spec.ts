import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { exampleCorners } from '../../../../shared/kinematics/examples';
import type { Corner, Vec3 } from '../../../../shared/schema/corner';
import type { AxleDesign } from '../features-api';
import { AxleDesignStore, type DesignRoute } from './axle-design-store';
import { getPoint } from './hardpoint-model';

const corner: Corner = exampleCorners.fsFrontWishbone;
const KEY = 'points.upperOuter';

function design(id: string, revision: number, c: Corner = corner): AxleDesign {
  return { id, vehicleId: 'v1', axle: 'front', name: `Design ${id}`, revision, status: 'draft', corner: c, updatedAt: '2026-01-01T00:00:00Z', updatedByName: 'Ada' };
}

const moved = (c: Corner, dz: number): Vec3 => {
  const p = getPoint(c, KEY)!;
  return [p[0], p[1], p[2] + dz];
};

/** Lets the resources start their requests, answer them, and the effects run. */
async function settle(): Promise<void> {
  TestBed.tick();
  await new Promise((r) => setTimeout(r));
  TestBed.tick();
}

describe('AxleDesignStore', () => {
  let store: AxleDesignStore;
  let http: HttpTestingController;
  const route = signal<DesignRoute>({ teamId: 't1', vehicleId: 'v1', designId: 'd1' });

  /** Answers the loads of one design: the design, its vehicle, the team, the revision list and proposals. */
  async function answerLoad(d: AxleDesign): Promise<void> {
    await settle();
    const base = `/api/teams/t1/axle-designs/${d.id}`;
    http.expectOne(base).flush(d);
    http.expectOne('/api/teams/t1/vehicles/v1').flush({ id: 'v1', data: { massKg: 300 } });
    http.match('/api/teams/t1').forEach((r) => r.flush({ id: 't1', name: 'Team', permissions: ['design:edit'] }));
    http.expectOne(`${base}/revisions`).flush([{ revision: d.revision, authorName: 'Ada', createdAt: d.updatedAt, message: null }]);
    http.expectOne(`${base}/proposals`).flush([]);
    await settle();
  }

  beforeEach(async () => {
    route.set({ teamId: 't1', vehicleId: 'v1', designId: 'd1' });
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), AxleDesignStore] });
    store = TestBed.inject(AxleDesignStore);
    http = TestBed.inject(HttpTestingController);
    store.follow(route);
    expect(store.state().status).toBe('loading');
    await answerLoad(design('d1', 4));
  });

  afterEach(() => http.verify());

  it('loads the design with its vehicle data and revisions, and starts with nothing to undo', () => {
    expect(store.state().status).toBe('ready');
    expect(store.saved()?.revision).toBe(4);
    expect(store.corner()).toEqual(corner);
    expect(store.vehicleData()).toEqual({ massKg: 300 });
    expect(store.revisions().map((r) => r.revision)).toEqual([4]);
    expect(store.canUndo()).toBe(false);
    expect(store.dirty()).toBe(false);
  });

  it('edits, undoes and redoes through the history, and knows what changed', () => {
    store.editPoint(KEY, moved(corner, 5));
    expect(store.changed()).toEqual([KEY]);
    expect(store.dirty()).toBe(true);
    expect(store.canUndo()).toBe(true);
    store.undo();
    expect(store.corner()).toEqual(corner);
    expect(store.dirty()).toBe(false);
    store.redo();
    expect(getPoint(store.corner()!, KEY)![2]).toBeCloseTo(getPoint(corner, KEY)![2] + 5, 9);
  });

  it('edits a setting that is not a point (the wheel radius) as an undo step that makes the design unsaved, and saves it', async () => {
    store.editSetting('wheel.radius', null, 262);
    expect(store.corner()!.wheel.radius).toBe(262);
    expect(store.changed()).toEqual(['wheel.radius']);
    expect(store.dirty()).toBe(true);
    store.undo();
    expect(store.corner()).toEqual(corner);
    expect(store.dirty()).toBe(false);
    store.redo();
    // Restoring the saved settings puts the radius back and keeps a moved point, as one undo step.
    store.editPoint(KEY, moved(corner, 5));
    store.restoreSettings();
    expect(store.corner()!.wheel.radius).toBe(corner.wheel.radius);
    expect(store.changed()).toEqual([KEY]);
    store.undo();
    expect(store.corner()!.wheel.radius).toBe(262);
    store.undo();
    const saving = store.save('');
    const put = http.expectOne('/api/teams/t1/axle-designs/d1/corner');
    expect(put.request.body.corner.wheel.radius).toBe(262);
    put.flush(design('d1', 5, store.corner()!));
    await expect(saving).resolves.toBe(true);
    expect(store.dirty()).toBe(false);
    await settle();
    http.expectOne('/api/teams/t1/axle-designs/d1/revisions').flush([]);
    http.expectOne('/api/teams/t1/axle-designs/d1/proposals').flush([]);
  });

  it('takes a choice and a compliance rate through the same setting edit: unsaved, undone, restored to rigid, and saved with the corner', async () => {
    store.editSetting('steered', null, false);
    store.editSetting('bushings.lowerFront', null, { radialNPerMm: 2000, axialNPerMm: 500 });
    expect(store.corner()!.steered).toBe(false);
    expect(store.changed()).toEqual(['steered', 'bushings.lowerFront']);
    expect(store.dirty()).toBe(true);
    store.undo();
    expect(store.corner()!.bushings).toBeUndefined();
    store.redo();
    // Restoring the saved settings makes the bushing rigid again (the saved corner has none) and steers the wheel again.
    store.restoreSettings();
    expect(store.corner()).toEqual(corner);
    expect(store.dirty()).toBe(false);
    store.undo();
    const saving = store.save('');
    const put = http.expectOne('/api/teams/t1/axle-designs/d1/corner');
    expect(put.request.body.corner.bushings).toEqual({ lowerFront: { radialNPerMm: 2000, axialNPerMm: 500 } });
    expect(put.request.body.corner.steered).toBe(false);
    put.flush(design('d1', 5, store.corner()!));
    await expect(saving).resolves.toBe(true);
    await settle();
    http.expectOne('/api/teams/t1/axle-designs/d1/revisions').flush([]);
    http.expectOne('/api/teams/t1/axle-designs/d1/proposals').flush([]);
  });

  it('saves over the loaded revision with the note, and refreshes the revision list', async () => {
    store.editPoint(KEY, moved(corner, 5));
    const saving = store.save('  raised the upper ball joint  ');
    const put = http.expectOne('/api/teams/t1/axle-designs/d1/corner');
    expect(put.request.method).toBe('PUT');
    expect(put.request.body).toEqual({ corner: store.corner(), baseRevision: 4, message: 'raised the upper ball joint' });
    put.flush(design('d1', 5, store.corner()!));
    await expect(saving).resolves.toBe(true);
    expect(store.saved()?.revision).toBe(5);
    expect(store.dirty()).toBe(false);
    expect(store.notice()).toBe('Saved as revision 5.');
    await settle();
    http.expectOne('/api/teams/t1/axle-designs/d1/revisions').flush([]);
    http.expectOne('/api/teams/t1/axle-designs/d1/proposals').flush([]);
  });

  it('shows a conflict when someone saved first; taking theirs keeps ours one undo step back', async () => {
    const mine = moved(corner, 5);
    store.editPoint(KEY, mine);
    const theirsCorner = structuredClone(corner);
    // They also changed the wheel's loaded radius: a setting that is not a point is listed too.
    theirsCorner.wheel.radius = 260;
    const saving = store.save('');
    http
      .expectOne('/api/teams/t1/axle-designs/d1/corner')
      .flush(
        { error: { code: 'conflict', message: 'revision 5 exists', details: { current: design('d1', 5, theirsCorner) } } },
        { status: 409, statusText: 'Conflict' },
      );
    await expect(saving).resolves.toBe(false);
    const conflict = store.conflict();
    expect(conflict?.theirs.revision).toBe(5);
    expect(conflict?.rows.map((r) => r.key)).toEqual([KEY, 'wheel.radius']);
    expect(conflict?.rows[0]?.yours).toEqual(mine);
    expect(conflict?.rows[1]).toEqual({ key: 'wheel.radius', name: 'Wheel, loaded radius', kind: 'length', theirs: [260], yours: [corner.wheel.radius] });

    store.takeTheirs();
    expect(store.conflict()).toBeNull();
    expect(store.saved()?.revision).toBe(5);
    expect(store.corner()).toEqual(theirsCorner);
    store.undo();
    expect(getPoint(store.corner()!, KEY)).toEqual(mine);
    await settle();
    http.expectOne('/api/teams/t1/axle-designs/d1/revisions').flush([]);
    http.expectOne('/api/teams/t1/axle-designs/d1/proposals').flush([]);
  });

  it('another design id loads that design and starts a fresh history', async () => {
    store.editPoint(KEY, moved(corner, 5));
    route.set({ teamId: 't1', vehicleId: 'v1', designId: 'd2' });
    await settle();
    expect(store.state().status).toBe('loading');
    const other = structuredClone(corner);
    await answerLoad(design('d2', 1, other));
    expect(store.saved()?.id).toBe('d2');
    expect(store.canUndo()).toBe(false);
    expect(store.dirty()).toBe(false);
  });

  it('shows why the design could not be loaded', async () => {
    route.set({ teamId: 't1', vehicleId: 'v1', designId: 'gone' });
    await settle();
    http.expectOne('/api/teams/t1/vehicles/v1').flush({ id: 'v1', data: null });
    http.expectOne('/api/teams/t1/axle-designs/gone').flush({ error: { code: 'not_found', message: 'No such axle design.' } }, { status: 404, statusText: 'Not Found' });
    http.expectOne('/api/teams/t1/axle-designs/gone/revisions').flush([]);
    http.expectOne('/api/teams/t1/axle-designs/gone/proposals').flush([]);
    await settle();
    expect(store.state()).toEqual({ status: 'error', message: 'No such axle design.' });
  });
});
