import { formatChange, formatFigure, profileLabel, statusWords } from './board-figures';

describe('board figures', () => {
  it('writes a change as a signed number, so it reads without colour', () => {
    expect(formatChange(0.125, 0.1, 3)).toBe('+0.025');
    expect(formatChange(0.1, 0.125, 3)).toBe('−0.025');
    expect(formatChange(1.2344, 1.2341, 3)).toBe('no change');
    expect(formatChange(null, 0.1, 3)).toBe('—');
    expect(formatChange(0.1, undefined, 3)).toBe('—');
  });

  it('shows figures with a real minus sign and no "−0"', () => {
    expect(formatFigure(-0.0421, 3)).toBe('−0.042');
    expect(formatFigure(-0.0001, 3)).toBe('0.000');
    expect(formatFigure(12.345, 2)).toBe('12.35');
    expect(formatFigure(null, 2)).toBe('—');
    expect(formatFigure(Number.NaN, 2)).toBe('—');
  });

  it('names statuses and track profiles in words', () => {
    expect(statusWords('changes_requested')).toBe('Returned for rework');
    expect(statusWords('something_new')).toBe('something_new');
    expect(profileLabel('bumpy-circuit')).toBe('Bumpy circuit');
  });
});
