import { mpa, newtonMetres, percent, sig, sigPair } from './format';

describe('sig (engineering significant figures)', () => {
  it.each([
    [123456, '123000'],
    [999.6, '1000'],
    [12.345, '12.3'],
    [3, '3.00'],
    [0.0015, '0.00150'],
    [-41.5, '-41.5'],
    [0, '0'],
  ])('%p -> %p', (x, expected) => {
    expect(sig(x)).toBe(expected);
  });

  it('spells out non-finite values instead of printing NaN', () => {
    expect(sig(Number.NaN)).toBe('not computable');
    expect(sig(Number.POSITIVE_INFINITY)).toBe('unbounded');
  });
});

describe('sigPair', () => {
  it('adds digits until a measured value and its limit read differently', () => {
    expect(sigPair(2.9996, 3)).toEqual(['2.9996', '3.0000']);
  });
  it('keeps three figures when they already differ', () => {
    expect(sigPair(2.5, 3)).toEqual(['2.50', '3.00']);
  });
});

describe('display units', () => {
  it('prints stress in MPa, torque in N·m and fractions in %', () => {
    expect(mpa(41_535_227.97)).toBe('41.5 MPa');
    expect(newtonMetres(123.579)).toBe('124 N·m');
    expect(percent(0.8)).toBe('80.0 %');
  });
});
