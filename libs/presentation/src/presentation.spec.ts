import { coefficient, countOf, formatQuantity, MINUS, sig, siRecord, verdictWord } from './presentation';

describe('report number formatting', () => {
  it.each([
    [26.2358, '26.2'],
    [173.976, '174.0'], // leading 1: four figures
    [6.4, '6.40'], // trailing zeros kept
    [30, '30.0'],
    [0.0063622, '0.00636'],
    [0.0009304, '0.000930'],
    [0.00009304, '9.30 × 10⁻⁵'],
    [9670.2, '9670'],
    [12345, '12350'],
    [9.9996, '10.00'], // rounds up into a leading 1
    [-57.041, `${MINUS}57.0`],
    [0, '0'],
    [1.5e-5, '1.500 × 10⁻⁵'],
    [2.07e11, '2.07 × 10¹¹'],
    [Number.NaN, '—'],
  ])('sig(%p) = %p', (x, expected) => {
    expect(sig(x)).toBe(expected);
  });

  it('never prints more than four significant figures', () => {
    for (let i = 0; i < 2000; i++) {
      const x = Math.exp((i / 2000) * 30 - 12) * (i % 2 ? -1 : 1);
      const mantissa = sig(x).split(' ×')[0];
      // significant digits: leading zeros never count; trailing zeros of an integer are placeholders
      const digits = (mantissa.includes('.') ? mantissa : mantissa.replace(/0+$/, '')).replace(/[^0-9]/g, '').replace(/^0+/, '');
      expect(digits.length).toBeLessThanOrEqual(4);
      expect(digits.length).toBeGreaterThanOrEqual(1);
    }
  });

  it('friction coefficients: two decimals, three when the third counts', () => {
    expect(coefficient(0.1)).toBe('0.10');
    expect(coefficient(0.15)).toBe('0.15');
    expect(coefficient(0.125)).toBe('0.125');
  });

  it('record values in SI: six figures, trailing zeros dropped', () => {
    expect(siRecord(0.032)).toBe('0.032');
    expect(siRecord(28000)).toBe('28000');
    expect(siRecord(530e6)).toBe('5.3 × 10⁸');
    expect(siRecord(11031611.669069378)).toBe('1.10316 × 10⁷');
  });

  it('converts to the unit system the design was entered in (exact inch and pound-force)', () => {
    expect(formatQuantity(0.0254, 'length', 'US')).toBe('1.000 in');
    expect(formatQuantity(0.0254, 'length', 'SI')).toBe('25.4 mm');
    expect(formatQuantity(4448.2216152605, 'force', 'US')).toBe('1000 lbf');
    expect(formatQuantity(6894757.293168361, 'stress', 'US')).toBe('1.000 ksi');
    expect(formatQuantity(6894757.293168361, 'pressure', 'US')).toBe('1000 psi');
    expect(formatQuantity(0.112984829, 'torque', 'US')).toBe('1.000 lbf·in');
    expect(formatQuantity(745.69987158227022, 'power', 'US')).toBe('1.000 hp');
    expect(formatQuantity(0.0254 / 60, 'travelSpeed', 'US')).toBe('1.000 in/min');
    expect(formatQuantity(1 / 60, 'travelSpeed', 'SI')).toBe('1.000 m/min');
    expect(formatQuantity(14.97, 'angle', 'SI')).toBe('14.97°');
    expect(formatQuantity(0.219, 'percent', 'SI')).toBe('21.9 %');
  });
});

describe('words for states and verdicts', () => {
  it('an approved revision with warnings reads "Warnings acknowledged", not as if it still needed acknowledgement', () => {
    expect(verdictWord('needs-acknowledgement', 'approved')).toBe('Warnings acknowledged');
    expect(verdictWord('needs-acknowledgement', 'submitted')).toBe('Needs acknowledgement');
    expect(verdictWord('blocked', 'rejected')).toBe('Blocked');
    expect(countOf(1, 'warning')).toBe('1 warning');
    expect(countOf(2, 'warning')).toBe('2 warnings');
  });
});
