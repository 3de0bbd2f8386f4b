import { inject, Pipe, PipeTransform } from '@angular/core';
import { figuresInUnits } from '../../../../shared/units/text';
import { DISPLAY_UNITS } from './num-pipe';

/**
 * `{{ caution.message | unitsText }}`: a sentence the engine wrote with SI
 * figures (a caution, a balance note, the bump-cost road) with each figure in
 * the user's unit system (`figuresInUnits`, shared/units/text.ts). Not pure,
 * as `num`: a change of unit system re-words what is shown.
 */
@Pipe({ name: 'unitsText', pure: false })
export class UnitsTextPipe implements PipeTransform {
  private readonly units = inject(DISPLAY_UNITS);

  transform(text: string | null | undefined): string {
    return text ? figuresInUnits(text, this.units()) : '';
  }
}
