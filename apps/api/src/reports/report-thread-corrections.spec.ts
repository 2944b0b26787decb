/**
 * The report shows the thread corrections of engine 1.1 and the design's own nut material:
 * which pressure class applied at which rubbing speed, a single value "used at any speed", the nut's own thread
 * root factor against its minimum, the tensile stress area beside the minor section, and a nut material as entered.
 */
import type { ReportInput } from './report-model';
import { buildReportView } from './report-model';
import { sectionNotesText } from './report-renderer';
import { harrowgateReportInput, harrowgateUsReportInput, HARROWGATE_INPUT } from './fixtures/harrowgate.fixture';
import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { checksOf, RULE_SET_2026_12_2 } from '@leadline/rules';

/** The Harrowgate report input with its design replaced (findings kept: only the figures are read here). */
function withDesign(raw: unknown): ReportInput {
  const base = harrowgateReportInput();
  const parsed = parseDesign(raw);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const evaluation = evaluate(parsed.design);
  return {
    ...base,
    revision: { ...base.revision, input: raw, normalized: parsed.design, evaluation },
    checks: checksOf(parsed.design, evaluation, RULE_SET_2026_12_2.thresholds),
  };
}

const notesOf = (input: ReportInput, id: string) => sectionNotesText(buildReportView(input).sections.find((s) => s.id === id) ?? { notes: null });

describe('report: thread corrections', () => {
  it('names the Table 8-4 class and rubbing speed that applied (Tr 32x6 at 90 rpm: hoisting screw, 0.137 m/s = 27 ft/min)', () => {
    const wear = notesOf(harrowgateReportInput(), 'wear').join(' ');
    expect(wear).toMatch(/hoisting screw \(medium speed, 20-40 ft\/min\)/);
    expect(wear).toMatch(/Table 8-4/);
    expect(wear).toMatch(/Allowable against rubbing speed: 11\.03 MPa up to 0\.0508 m\/s; 5\.52 MPa up to 0\.203 m\/s; 1\.034 MPa above/);
  });

  it("says a design's own single allowable is used at any speed", () => {
    const input = withDesign({ ...HARROWGATE_INPUT, nut: { length: '48 mm', material: 'bronze', allowablePressure: '9 MPa' } });
    expect(notesOf(input, 'wear').join(' ')).toMatch(/the design's own single value, used at any rubbing speed/);
    const row = buildReportView(input).input.materials.find((m) => m.property.startsWith('Allowable bearing pressure'));
    expect(row?.property).toMatch(/used at any rubbing speed/);
  });

  it("shows a nut material of the design's own as entered", () => {
    const input = withDesign({ ...HARROWGATE_INPUT, nut: { length: '48 mm', material: 'CuSn12 to works spec N-12', allowablePressure: '9 MPa', allowablePv: '2 MPa*m/s', yieldStrength: '140 MPa' } });
    const view = buildReportView(input);
    const material = view.input.materials.find((m) => m.part === 'Nut' && m.property === 'Material');
    expect(material).toMatchObject({ value: 'CuSn12 to works spec N-12', origin: "as entered (the design's own material)" });
    expect(notesOf(input, 'wear').join(' ')).toMatch(/CuSn12 to works spec N-12 \(the design's own material, as entered\)/);
  });

  it("holds the nut's own thread root factor against the revision's rule-set minimum", () => {
    const base = harrowgateReportInput();
    const view = buildReportView(base);
    const row = view.safetyFactors.find((f) => f.key === 'nut-thread-root-yield');
    expect(row?.value).toBe(base.revision.evaluation.safetyFactors.nutThreadRoot);
    expect(row).toMatchObject({ limit: 3, limitFrom: 'nut-thread-root-yield' });
    const lines = view.sections.flatMap((s) => s.lines).map((l) => l.path);
    expect(lines).toEqual(expect.arrayContaining(['stresses.nutThread.rootBending', 'stresses.nutThread.rootShear', 'stresses.firstThread.load']));
  });

  it('a missing nut yield that blocks is shown as not computed, not "not applicable"', () => {
    const input = withDesign({ ...HARROWGATE_INPUT, nut: { length: '48 mm', material: 'cast-iron' } });
    // cast iron has no yield strength in the library; on lifting duty rule set 2026.12-2 blocks on it (missingValues.onLifting)
    const view = buildReportView(input);
    expect(view.safetyFactors.find((f) => f.key === 'nut-thread-root-yield')).toMatchObject({ status: 'below', statusText: 'not computed: a value is missing (blocking)' });
  });

  it('prints the stripping planes with their areas', () => {
    const threads = notesOf(harrowgateReportInput(), 'threads').join(' ');
    expect(threads).toMatch(/nut's minor diameter D1 = 26\.0 mm/); // ISO 2901 D1 = d - P = 26 mm (threads.md Sec. 1.2)
    expect(threads).toMatch(/worse of the two root fillets/);
  });

  it('reports the tensile stress area beside the minor section for a 60 deg thread, for reference only (M20: 244.79 mm^2, ISO 898-1)', () => {
    const input = withDesign({ ...HARROWGATE_INPUT, thread: { form: 'iso-metric', size: 'M20' }, nut: { length: '25 mm', material: 'bronze' } });
    const rows = buildReportView(input).input.geometry;
    expect(rows.find((r) => r.label.startsWith('Tensile stress area'))?.value).toMatch(/^245 mm²$/);
    expect(rows.find((r) => r.label.startsWith('Tensile stress area'))?.label).toMatch(/no check uses it/);
    expect(buildReportView(harrowgateUsReportInput()).input.geometry.some((r) => r.label.startsWith('Tensile stress area'))).toBe(false);
    const line = buildReportView(input).sections.flatMap((x) => x.lines).find((l) => l.path === 'geometry.tensileStressArea');
    expect(line?.source).toMatch(/ISO 898-1/);
    expect(line?.substitution).toBe('A_s = (π/4) × (20.0 mm − 0.938194 × 2.50 mm)² = 245 mm²');
  });

  it('names a tolerance class and its minimum-material diameters, or says the basic profile was used', () => {
    const basic = buildReportView(harrowgateReportInput()).input.geometry.find((r) => r.label === 'Tolerance class');
    // the engine's own statement of what the checks used (tolerances.ts minimumMaterial().basis)
    expect(basic?.value).toMatch(/^basic profile \(no tolerance class named\): minimum-material diameters are smaller for the screw/);
    const input = withDesign({ ...HARROWGATE_INPUT, thread: { form: 'trapezoidal', size: 'Tr 32x6', toleranceClass: '7H/7e' } });
    const rows = buildReportView(input).input.geometry;
    expect(rows.find((r) => r.label.startsWith('Tolerance class'))?.value).toMatch(/^7H\/7e: ISO 2903/);
    // threadlib design/TR.csv, Tr 32x6 7e: d min 31.575, d2 min 28.54, d3 min 24.463; 7H: D1 max 26.56, D2 max 29.45 (mm)
    expect(rows.find((r) => r.label.startsWith('Minimum-material screw'))?.value).toBe('31.6 mm, 28.5 mm, 24.5 mm');
    expect(rows.find((r) => r.label.startsWith('Minimum-material nut'))?.value).toBe('26.6 mm, 29.4 mm');
  });
});
