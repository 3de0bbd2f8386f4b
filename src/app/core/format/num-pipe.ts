import { inject, InjectionToken, Injector, Pipe, PipeTransform, Signal } from '@angular/core';
import type { DisplayUnits } from '../api-types';
import { AuthService } from '../auth/auth-service';
import { formatNum, type NumFormat } from './num';

/** The user's unit system as a signal; the signed-in user's choice unless provided otherwise. */
export const DISPLAY_UNITS = new InjectionToken<Signal<DisplayUnits>>('DISPLAY_UNITS', {
  providedIn: 'root',
  factory: () => inject(AuthService).displayUnits,
});

/**
 * `{{ toe | num: { decimals: 3 } }}`, `{{ rate | num: { sig: 4 } }}`,
 * `{{ travel | num: { kind: 'length' } }}` (in the user's units). Not pure: a
 * change of unit system re-renders every figure with a kind. The unit system
 * is looked up only when a kind is named, so screens without one need no session.
 */
@Pipe({ name: 'num', pure: false })
export class NumPipe implements PipeTransform {
  private readonly injector = inject(Injector);
  private units: Signal<DisplayUnits> | null = null;

  transform(value: number | null | undefined, format: NumFormat): string {
    if (format.kind && !this.units) this.units = this.injector.get(DISPLAY_UNITS);
    return formatNum(value, format, format.kind && this.units ? this.units() : 'si');
  }
}
