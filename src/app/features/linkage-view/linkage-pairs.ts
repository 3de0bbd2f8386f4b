import type { Corner } from '../../../../shared/schema/corner';

/** Points carried by the upright (linkage keys of `corner.points`). */
export const UPRIGHT_POINT_NAMES: ReadonlySet<string> = new Set(['wheelCentre', 'spindle', 'lowerOuter', 'upperOuter', 'tieRodOuter', 'strutLower']);

/** What to draw between two points: a link to the body, or an edge of the upright. */
export type PairKind = 'link' | 'upright';

/** The lines of a corner's linkage drawing: links (arms, tie rod, strut, five links) and the upright's outline. */
export function linkagePairs(corner: Corner): readonly (readonly [string, string, PairKind])[] {
  const pairs: [string, string, PairKind][] = [];
  if (corner.type === 'double-wishbone' || corner.type === 'strut') {
    pairs.push(['lowerFront', 'lowerOuter', 'link'], ['lowerRear', 'lowerOuter', 'link'], ['tieRodInner', 'tieRodOuter', 'link']);
  }
  if (corner.type === 'double-wishbone') {
    pairs.push(
      ['upperFront', 'upperOuter', 'link'],
      ['upperRear', 'upperOuter', 'link'],
      ['lowerOuter', 'upperOuter', 'upright'],
      ['upperOuter', 'tieRodOuter', 'upright'],
      ['tieRodOuter', 'lowerOuter', 'upright'],
      ['lowerOuter', 'spindle', 'upright'],
      ['upperOuter', 'spindle', 'upright'],
    );
  }
  if (corner.type === 'strut') {
    pairs.push(
      ['strutTop', 'strutLower', 'link'],
      ['lowerOuter', 'strutLower', 'upright'],
      ['strutLower', 'tieRodOuter', 'upright'],
      ['tieRodOuter', 'lowerOuter', 'upright'],
      ['lowerOuter', 'spindle', 'upright'],
      ['strutLower', 'spindle', 'upright'],
    );
  }
  if (corner.type === 'five-link') {
    for (let k = 1; k <= 5; k++) {
      pairs.push([`link${k}Inner`, `link${k}Outer`, 'link'], [`link${k}Outer`, 'spindle', 'upright']);
    }
  }
  pairs.push(['spindle', 'wheelCentre', 'upright']);
  return pairs;
}
