import { describe, expect, it } from 'vitest';
import { splitDim, splitFit, stripUnit, toleranceInches, unitOf, withUnit } from '@/lib/searchFitText';

describe('search fit text', () => {
  it('search fit text · a bare number on the inch form · takes the inch mark, typed units stay', () => {
    expect(withUnit('3.5', 'in')).toBe('3.5in');
    expect(withUnit('3 1/2', 'in')).toBe('3 1/2in');
    expect(withUnit('90mm', 'in')).toBe('90mm');
    expect(withUnit('90', 'mm')).toBe('90');
  });

  it('search fit text · a space and a dimension from the address · split back into fields', () => {
    expect(splitFit('120x80 × 40')).toEqual(['120', '80', '40']);
    expect(splitFit('')).toEqual([]);
    expect(splitDim('rod bore:15.2:0.3')).toEqual({ name: 'rod bore', value: '15.2', tol: '0.3' });
    expect(splitDim('rod bore:15.2')).toEqual({ name: 'rod bore', value: '15.2', tol: '' });
    expect(splitDim('a:b:15:0.1')).toEqual({ name: 'a:b', value: '15', tol: '0.1' });
  });

  it('search fit text · lengths from the address · inches only when every one says so', () => {
    expect(unitOf(['3.5in', '2"'])).toBe('in');
    expect(unitOf(['3.5in', '90mm'])).toBe('mm');
    expect(unitOf([])).toBe('mm');
    expect(stripUnit('3.5in', 'in')).toBe('3.5');
    expect(stripUnit('90 mm', 'mm')).toBe('90');
  });

  it('search fit text · a tolerance in inches · 1 in = 25.4 mm exactly, three decimals below 0.1 in', () => {
    // the international inch, 25.4 mm exactly (NIST SP 811, B.8)
    expect(toleranceInches(0.254)).toBe('0.010');
    expect(toleranceInches(25.4)).toBe('1.00');
  });
});
