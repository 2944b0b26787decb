/**
 * Chart series read from a stored evaluation's formula trace: they pass through the tabulated torques and critical
 * load (the engine's own figures), and they follow the trace, not today's tables, so a revision of an earlier
 * engine is drawn with the inputs it was computed with. Wiring tests of the series against the same evaluation; the
 * formulas themselves are tested against published examples in mechanics.spec.ts.
 */
import { parseDesign } from '@leadline/contracts';
import { columnCurveFromTrace, torqueSweepFromTrace } from './chart-series';
import { evaluate } from './evaluate';
import { MAIN_LIFT_SCREW_ENGINE_1_0_0 } from '../../../apps/api/src/seed/recorded-history';

const close = (a: number, b: number, rtol = 1e-12) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rtol * Math.max(1, Math.abs(b)));

// An invented compressed jack (Tr 32x6, 28 kN, 650 mm, fixed-pinned) with a plain collar and typed friction ranges
const JACK = {
  thread: { form: 'trapezoidal', size: 'Tr 32x6' },
  load: { axial: '28 kN', sense: 'compression' },
  friction: {
    thread: { min: 0.1, max: 0.16, source: { kind: 'handbook', reference: "Shigley's Mechanical Engineering Design, 9th ed., Table 8-5" } },
    collar: { min: 0.08, max: 0.12, source: { kind: 'handbook', reference: "Shigley's Mechanical Engineering Design, 9th ed., Table 8-6" } },
  },
  collar: { kind: 'plain', meanDiameter: '45 mm' },
  nut: { length: '48 mm', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '650 mm', ends: 'fixed-pinned' },
  duty: { kind: 'lifting', speed: '30 rpm', brake: true, vibration: false },
};

describe('chart series from the stored trace', () => {
  const parsed = parseDesign(JACK);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const e = evaluate(parsed.design);

  it('the torque sweep passes through the tabulated torques at both ends of the friction range', () => {
    const sweep = torqueSweepFromTrace(e, 400)!;
    const at = (f: number) => sweep.points.find((p) => p.f === f)!;
    close(at(0.1).raise, e.torque.raise.atMinFriction);
    close(at(0.1).lower, e.torque.lower.atMinFriction);
    close(at(0.16).raise, e.torque.raise.atMaxFriction);
    close(at(0.16).lower, e.torque.lower.atMaxFriction);
    close(at(0.1).fc, 0.08);
    close(at(0.16).fc, 0.12);
    expect(sweep.points[0].f).toBe(0);
    // the thread-alone lowering torque changes sign at the self-locking boundary
    const change = sweep.points.findIndex((p, i) => i > 0 && sweep.points[i - 1].lowerThread < 0 && p.lowerThread >= 0);
    expect(sweep.points[change - 1].f).toBeLessThan(e.selfLocking.boundaryFriction);
    expect(sweep.points[change].f).toBeGreaterThanOrEqual(e.selfLocking.boundaryFriction);
  });

  it('the column curve meets the critical load and reads C and A from the trace, not from the design or today’s table', () => {
    const curve = columnCurveFromTrace(e, parsed.design.load.axial)!;
    const A = e.trace['buckling.criticalLoad'].inputs.A;
    close(curve.critical.stress, (e.buckling.criticalLoad as number) / A);
    close(curve.johnson[curve.johnson.length - 1].stress, curve.euler[0].stress, 1e-9);
    // a trace recorded with another end-condition constant is drawn with it
    const other = { ...e, trace: { ...e.trace, 'buckling.criticalLoad': { ...e.trace['buckling.criticalLoad'], inputs: { ...e.trace['buckling.criticalLoad'].inputs, C: 2 } } } };
    expect(columnCurveFromTrace(other, parsed.design.load.axial)!.euler[5].stress).not.toBe(curve.euler[5].stress);
  });

  it('a revision stored by engine 1.0.0 is charted from its own trace', () => {
    const r = MAIN_LIFT_SCREW_ENGINE_1_0_0 as unknown as { evaluation: typeof e; normalized: { load: { axial: number } } };
    const sweep = torqueSweepFromTrace(r.evaluation)!;
    const hi = sweep.points.find((p) => p.f === sweep.range.max)!;
    close(hi.raise, r.evaluation.torque.raise.atMaxFriction);
    const curve = columnCurveFromTrace(r.evaluation, r.normalized.load.axial)!;
    close(curve.critical.stress * r.evaluation.trace['buckling.criticalLoad'].inputs.A, r.evaluation.buckling.criticalLoad as number);
  });

  it('draws nothing the trace does not hold', () => {
    expect(torqueSweepFromTrace({ ...e, trace: {} })).toBeNull();
    expect(columnCurveFromTrace({ ...e, trace: {} }, 1)).toBeNull();
  });
});
