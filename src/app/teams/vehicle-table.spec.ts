import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { VehicleSummary } from '../core/api-types';
import { VehicleTable } from './vehicle-table';

const EMBER: VehicleSummary = {
  id: 'v-ember',
  name: 'TUR-26 Ember',
  archived: false,
  revision: 4,
  updatedAt: '2026-11-30T09:15:00.000Z',
  updatedByName: 'Eli Marsh',
};
const CINDER: VehicleSummary = { ...EMBER, id: 'v-cinder', name: 'TUR-25 Cinder', archived: true, revision: 9 };

async function render(canManage: boolean) {
  const fixture = TestBed.createComponent(VehicleTable);
  fixture.componentRef.setInput('teamId', 't-tal');
  fixture.componentRef.setInput('vehicles', [EMBER, CINDER]);
  fixture.componentRef.setInput('canManage', canManage);
  await fixture.whenStable();
  const root = fixture.nativeElement as HTMLElement;
  const buttons = () => [...root.querySelectorAll('button')].map((b) => b.getAttribute('aria-label'));
  return { fixture, root, buttons };
}

describe('VehicleTable', () => {
  beforeEach(async () => {
    await TestBed.configureTestingModule({
      imports: [VehicleTable],
      providers: [provideRouter([])],
    }).compileComponents();
  });

  it('lists every vehicle with a link to its screen', async () => {
    const { root } = await render(false);
    const links = [...root.querySelectorAll<HTMLAnchorElement>('a.vehicle-link')];
    expect(links.map((a) => a.textContent?.trim())).toEqual(['TUR-26 Ember', 'TUR-25 Cinder']);
    expect(links.map((a) => a.getAttribute('href'))).toEqual([
      '/teams/t-tal/vehicles/v-ember',
      '/teams/t-tal/vehicles/v-cinder',
    ]);
    expect(root.querySelectorAll('tr[mat-row]').length).toBe(2);
    expect(root.textContent).toContain('by Eli Marsh');
  });

  it('shows no commands to a user without vehicle:manage', async () => {
    const { root, buttons } = await render(false);
    expect(buttons()).toEqual([]);
    const headers = [...root.querySelectorAll('th')].map((th) => th.textContent?.trim());
    expect(headers).toEqual(['Vehicle', 'Revision', 'Last change']);
  });

  it('offers rename and archive, or restore for archived vehicles, to managers', async () => {
    const { buttons } = await render(true);
    expect(buttons()).toEqual([
      'Rename TUR-26 Ember',
      'Archive TUR-26 Ember',
      'Rename TUR-25 Cinder',
      'Restore TUR-25 Cinder',
    ]);
  });

  it('emits the vehicle a command is for', async () => {
    const { fixture, root } = await render(true);
    const archived: VehicleSummary[] = [];
    const restored: VehicleSummary[] = [];
    const renamed: VehicleSummary[] = [];
    fixture.componentInstance.archive.subscribe((v) => archived.push(v));
    fixture.componentInstance.restore.subscribe((v) => restored.push(v));
    fixture.componentInstance.rename.subscribe((v) => renamed.push(v));
    root.querySelector<HTMLButtonElement>('[aria-label="Archive TUR-26 Ember"]')!.click();
    root.querySelector<HTMLButtonElement>('[aria-label="Restore TUR-25 Cinder"]')!.click();
    root.querySelector<HTMLButtonElement>('[aria-label="Rename TUR-25 Cinder"]')!.click();
    expect(archived.map((v) => v.id)).toEqual(['v-ember']);
    expect(restored.map((v) => v.id)).toEqual(['v-cinder']);
    expect(renamed.map((v) => v.id)).toEqual(['v-cinder']);
  });
});
