import { collarFrictionFor, columnCurve, renderReportCharts, torqueFrictionSweep } from './charts';
import { harrowgateReportInput, harrowgateUsReportInput } from './fixtures/harrowgate.fixture';
import { buildReportView } from './report-model';

const close = (a: number, b: number, rtol = 1e-12) => expect(Math.abs(a - b)).toBeLessThanOrEqual(rtol * Math.max(1, Math.abs(b)));

describe('report charts', () => {
  const input = harrowgateReportInput();
  const { normalized: design, evaluation: e } = input.revision;

  it('torque sweep: passes through the tabulated torques at both ends of the friction range', () => {
    const sweep = torqueFrictionSweep(design, e);
    const at = (f: number) => sweep.points.find((p) => p.f === f);
    const lo = at(design.friction.thread.min);
    const hi = at(design.friction.thread.max);
    close(lo?.raise as number, e.torque.raise.atMinFriction);
    close(lo?.lower as number, e.torque.lower.atMinFriction);
    close(hi?.raise as number, e.torque.raise.atMaxFriction);
    close(hi?.lower as number, e.torque.lower.atMaxFriction);
    expect(sweep.points[0].f).toBe(0);
    close(sweep.points[sweep.points.length - 1].f, 1.5 * design.friction.thread.max);
  });

  it('torque sweep: the thread-alone lowering torque changes sign at the self-locking boundary', () => {
    const sweep = torqueFrictionSweep(design, e, 400);
    const change = sweep.points.findIndex((p, i) => i > 0 && sweep.points[i - 1].lowerThread < 0 && p.lowerThread >= 0);
    expect(change).toBeGreaterThan(0);
    expect(sweep.points[change - 1].f).toBeLessThan(e.selfLocking.boundaryFriction);
    expect(sweep.points[change].f).toBeGreaterThanOrEqual(e.selfLocking.boundaryFriction);
  });

  it('collar friction follows the thread friction linearly between the ends of both ranges, never negative', () => {
    const c = design.friction.collar as { min: number; max: number };
    close(collarFrictionFor(design.friction.thread.min, design), c.min);
    close(collarFrictionFor(design.friction.thread.max, design), c.max);
    expect(collarFrictionFor(0, design)).toBeGreaterThanOrEqual(0);
  });

  it('column curve: Johnson meets Euler at the transition; the design point is F/A', () => {
    const curve = columnCurve(design, e);
    if (!curve) throw new Error('buckling applies to the compressed fixture');
    close(curve.johnson[curve.johnson.length - 1].stress, curve.euler[0].stress, 1e-9);
    close(curve.johnson[0].stress, design.screw.yieldStrength);
    const area = (Math.PI * e.geometry.minorDiameter ** 2) / 4;
    close(curve.design.stress, design.load.axial / area);
    close(curve.critical.stress, (e.buckling.criticalLoad as number) / area);
    expect(columnCurve(harrowgateUsReportInput().revision.normalized, harrowgateUsReportInput().revision.evaluation)).toBeNull();
  });

  it('renders three self-contained SVGs, fresh for each revision', async () => {
    const charts = await renderReportCharts(input.revision, buildReportView(input));
    for (const svg of [charts.torqueFriction, charts.column, charts.safetyFactors]) {
      expect(svg).toMatch(/^<svg /);
      expect(svg).not.toMatch(/https?:|xmlns|<image|href=/);
    }
    expect(charts.torqueFriction).toContain('self-locking boundary f = cos αₙ tan λ = 0.0636');
    expect(charts.column).toContain('design F/A = 57.0 MPa');
    expect(charts.safetyFactors).toContain('3.97  (min 3.50)'); // Euler P_cr / F by hand (see report-model.spec.ts); 2026.12-2 lifting minimum
    const usInput = harrowgateUsReportInput();
    const us = await renderReportCharts(usInput.revision, buildReportView(usInput));
    expect(us.column).toBeNull();
    expect(us.torqueFriction).toContain('Torque [lbf·in]');
    expect(us.torqueFriction).not.toEqual(charts.torqueFriction);
  });
});
