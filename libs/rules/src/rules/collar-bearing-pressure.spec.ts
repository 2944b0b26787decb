/**
 * collar-bearing-pressure: the pressure may reach the allowable the design states (limit 100 %).
 */
import { FULL_LIFTING_INPUT } from '../testing/designs';
import { limitCases } from '../testing/limit-cases';
import { collarBearingPressureRule } from './collar-bearing-pressure.rule';

describe('collar-bearing-pressure', () => {
  limitCases({
    rule: collarBearingPressureRule,
    input: FULL_LIFTING_INPUT,
    limit: 1,
    kind: 'maximum',
    past: 'blocking',
    group: 'collarBearing',
    subject: 'collarBearing.pressureRatio',
  });
});

describe('collar-bearing-pressure on the real engine', () => {
  it('25 kN on a 60/42 mm annulus is 17.3 MPa: blocks against 15 MPa (4 F / (pi (D_o^2 - D_i^2)), hand arithmetic)', () => {
    const { evaluated } = jest.requireActual<typeof import('../testing/designs')>('../testing/designs');
    const { RULE_SET_2026_12_3 } = jest.requireActual<typeof import('../rule-set')>('../rule-set');
    const e = evaluated({
      ...FULL_LIFTING_INPUT,
      load: { axial: '25 kN', sense: 'compression' },
      collar: { kind: 'annular', outerDiameter: '60 mm', innerDiameter: '42 mm', model: 'uniform-wear', allowablePressure: '15 MPa' },
    });
    const expected = (4 * 25000) / (Math.PI * (0.06 ** 2 - 0.042 ** 2)) / 15e6; // 17.34 MPa / 15 MPa = 1.156
    const f = collarBearingPressureRule.check({ design: e.design, evaluation: e.evaluation, thresholds: RULE_SET_2026_12_3.thresholds });
    expect(f?.severity).toBe('blocking');
    expect(f?.measured as number).toBeCloseTo(expected, 6);
  });
});
