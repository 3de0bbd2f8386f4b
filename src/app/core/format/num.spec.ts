import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import type { DisplayUnits } from '../api-types';
import { formatNum } from './num';
import { DISPLAY_UNITS, NumPipe } from './num-pipe';

describe('formatNum', () => {
  it('writes decimals and significant figures apart', () => {
    expect(formatNum(12.3456, { decimals: 1 })).toBe('12.3');
    expect(formatNum(-0.0123456, { decimals: 3 })).toBe('-0.012');
    expect(formatNum(12.3456, { sig: 3 })).toBe('12.3');
    expect(formatNum(0.000123456, { sig: 3 })).toBe('0.000123');
    expect(formatNum(1234567, { sig: 3 })).toBe('1230000');
    expect(formatNum(2.5, { sig: 4 })).toBe('2.5'); // trailing zeros dropped
    expect(formatNum(0, { sig: 3 })).toBe('0');
  });

  it('writes a missing or non-finite value as an en dash, or the text asked for', () => {
    expect(formatNum(null, { decimals: 2 })).toBe('–');
    expect(formatNum(undefined, { sig: 2 })).toBe('–');
    expect(formatNum(Number.NaN, { decimals: 2 })).toBe('–');
    expect(formatNum(Number.POSITIVE_INFINITY, { sig: 2, missing: '' })).toBe('');
  });

  it('shows a quantity in the chosen unit system (1 in = 25.4 mm, 1 lb = 0.45359237 kg exactly: definitions of the inch and pound)', () => {
    expect(formatNum(25.4, { kind: 'length' }, 'imperial')).toBe('1');
    expect(formatNum(25.4, { kind: 'length' }, 'si')).toBe('25.4');
    expect(formatNum(100, { kind: 'mass', decimals: 1 }, 'imperial')).toBe('220.5');
    // 1 lbf/in = 4.4482216152605 N / 25.4 mm = 0.17513 N/mm.
    expect(formatNum(0.175126835, { kind: 'linearRate', sig: 4 }, 'imperial')).toBe('1');
    // Angles are the same in both systems.
    expect(formatNum(1.2345, { kind: 'angle' }, 'imperial')).toBe('1.23');
  });

  it('writes a typographic minus or a signed change when asked, and no sign on what rounds to zero', () => {
    expect(formatNum(-0.0421, { decimals: 3, sign: 'minus' })).toBe('\u22120.042');
    expect(formatNum(0.0421, { decimals: 3, sign: 'minus' })).toBe('0.042');
    expect(formatNum(-0.0001, { decimals: 3, sign: 'minus' })).toBe('0.000');
    expect(formatNum(0.025, { decimals: 3, sign: 'change' })).toBe('+0.025');
    expect(formatNum(-0.025, { decimals: 3, sign: 'change' })).toBe('\u22120.025');
    expect(formatNum(0.0003, { decimals: 3, sign: 'change' })).toBe('0');
    expect(formatNum(-25.4, { kind: 'length', sign: 'change' }, 'imperial')).toBe('\u22121');
  });
});

describe('NumPipe', () => {
  it('follows the unit system signal for values with a kind, and needs none without', () => {
    const units = signal<DisplayUnits>('si');
    TestBed.configureTestingModule({ providers: [{ provide: DISPLAY_UNITS, useValue: units }] });
    const pipe = TestBed.runInInjectionContext(() => new NumPipe());
    expect(pipe.transform(50.8, { kind: 'length' })).toBe('50.8');
    units.set('imperial');
    expect(pipe.transform(50.8, { kind: 'length' })).toBe('2');
    expect(pipe.transform(50.8, { decimals: 0 })).toBe('51');
  });
});
