/**
 * Unit conversion at the engine's boundary, against NIST SP 811 (2008 ed.), Appendix B.8/B.9.
 *
 * Two checks per unit:
 *  - exact: the factor derived from the exact definitions 1 in = 0.0254 m, 1 ft = 0.3048 m, 1 lb = 0.45359237 kg
 *    and g_n = 9.80665 m/s^2 (so 1 lbf = 4.4482216152605 N exactly); tolerance 1e-14 only for binary floating point.
 *  - printed: the factor as NIST SP 811 App. B.8 prints it, to 7 significant figures (from memory); tolerance half a
 *    unit in the 7th figure.
 */
import { fromSi, parseQuantity, QuantityError, type Dimension, type Quantity } from './units';
import { expectClose } from './test-support';

const IN = 0.0254;
const FT = 0.3048;
const LB = 0.45359237;
const LBF = LB * 9.80665;

function si(text: string, dimension: Dimension): Quantity {
  const q = parseQuantity(text, dimension);
  if (q instanceof QuantityError) throw new Error(`${text}: ${q.message}`);
  return q;
}

describe('NIST SP 811 App. B conversions through parseQuantity', () => {
  // [unit text, dimension, exact SI factor, NIST SP 811 B.8 printed factor (from memory) or null, US customary]
  const rows: ReadonlyArray<readonly [string, Dimension, number, number | null, boolean]> = [
    ['in', 'length', IN, 2.54e-2, true],
    ['ft', 'length', FT, 3.048e-1, true],
    ['lbf', 'force', LBF, 4.448222, true],
    ['psi', 'stress', LBF / IN ** 2, 6.894757e3, true],
    ['ksi', 'stress', (1000 * LBF) / IN ** 2, 6.894757e6, true],
    ['kpsi', 'stress', (1000 * LBF) / IN ** 2, 6.894757e6, true], // Shigley's spelling of ksi (its tables print kpsi)
    ['lbf*in', 'torque', LBF * IN, 1.129848e-1, true],
    ['lbf*ft', 'torque', LBF * FT, 1.355818, true],
    ['lb/in^3', 'density', LB / IN ** 3, 2.76799e4, true],
    ['lb/ft^3', 'density', LB / FT ** 3, 1.601846e1, true], // "lb" is the avoirdupois pound (mass), 0.45359237 kg
    ['in/min', 'linearSpeed', IN / 60, null, true], // derived from the exact inch and minute; not a B.8 row
    ['ft/min', 'linearSpeed', FT / 60, 5.08e-3, true],
    ['psi*ft/min', 'pv', ((LBF / IN ** 2) * FT) / 60, null, true], // Mott's pV unit, derived from exact psi and ft/min
    // rotational speed is carried in rev/min, so "rpm" is the identity and rad/s converts by 60/(2 pi)
    ['rpm', 'rotationalSpeed', 1, null, false],
    ['rad/s', 'rotationalSpeed', 60 / (2 * Math.PI), null, false],
    ['mm', 'length', 1e-3, null, false],
    ['kN', 'force', 1e3, null, false],
    ['MPa', 'stress', 1e6, null, false],
    ['N*m', 'torque', 1, null, false],
    ['kg/m^3', 'density', 1, null, false],
    ['m/min', 'linearSpeed', 1 / 60, null, false],
  ];

  it.each(rows)('1 %s (%s): exact factor, NIST printed factor, unit system', (unit, dimension, exact, printed, us) => {
    const q = si(`1 ${unit}`, dimension);
    expectClose(q.si, exact, { rtol: 1e-14, label: `1 ${unit} exact` });
    if (printed !== null) expectClose(q.si, printed, { rtol: 5e-7, label: `1 ${unit} vs NIST SP 811 B.8` });
    expect(q.usCustomary).toBe(us);
    // and back again, as reports do
    expectClose(fromSi(q.si, unit, dimension), 1, { rtol: 1e-14, label: `fromSi ${unit}` });
  });

  it('psi is exactly lbf/in^2 and ksi exactly 1000 psi, as NIST SP 811 defines them (so a design means the same in either spelling)', () => {
    expect(si('1 psi', 'stress').si).toBe(si('1 lbf/in^2', 'stress').si);
    expectClose(si('1 ksi', 'stress').si, 1000 * si('1 psi', 'stress').si, { rtol: 1e-15 });
    // materials.ts keeps its own exact psi constant for library allowables; both must agree
    expectClose(si('1600 psi', 'stress').si, 1600 * 6894.757293168361, { rtol: 1e-15 });
  });

  it('parses the number in all its ordinary spellings', () => {
    expectClose(si('12mm', 'length').si, 0.012, { rtol: 1e-15 });
    expectClose(si(' 1.5 in ', 'length').si, 0.0381, { rtol: 1e-15 });
    expectClose(si('.5 in', 'length').si, 0.0127, { rtol: 1e-15 });
    expectClose(si('2.5e3 N', 'force').si, 2500, { rtol: 1e-15 });
    expectClose(si('+7 deg', 'angle').si, (7 * Math.PI) / 180, { rtol: 1e-15 });
  });

  it.each([
    ['12 MPa', 'length', /is not a length/],
    ['12 furlongz', 'length', /unknown unit "furlongz"/],
    ['abc', 'length', /expected "<number> <unit>"/],
    ['NaN mm', 'length', /expected "<number> <unit>"/],
    ['12', 'length', /expected "<number> <unit>"/],
    ['1e999 mm', 'length', /not a finite number/],
    ['1e308 GPa', 'stress', /too large to compute with/], // finite as typed, 1e317 Pa after conversion (IEEE 754 max ~1.8e308)
    ['1e306 kN*m', 'torque', /too large to compute with/],
    ['1 Hz', 'rotationalSpeed', /is not a rotational speed/], // Hz carries no angle: cycles, not revolutions, are ambiguous
    ['5 lbf', 'torque', /is not a torque/],
  ] as const)('rejects "%s" as a %s', (text, dimension, message) => {
    const q = parseQuantity(text, dimension);
    expect(q).toBeInstanceOf(QuantityError);
    expect((q as QuantityError).message).toMatch(message);
  });

  it('fromSi refuses a unit of the wrong dimension', () => {
    expect(() => fromSi(1, 'MPa', 'length')).toThrow(/cannot express length/);
    expect(() => fromSi(1, 'furlongz', 'length')).toThrow();
  });
});
