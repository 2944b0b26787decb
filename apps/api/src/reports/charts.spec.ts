import { renderReportCharts } from './charts';
import { harrowgateReportInput, harrowgateUsReportInput } from './fixtures/harrowgate.fixture';
import { buildReportView } from './report-model';

describe('report charts', () => {
  const input = harrowgateReportInput();

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
