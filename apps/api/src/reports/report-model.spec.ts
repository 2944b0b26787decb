import { FORMULAS } from '@leadline/mechanics';
import { formatNumber } from '@leadline/presentation';
import { harrowgateReportInput, harrowgateUsReportInput } from './fixtures/harrowgate.fixture';
import { buildReportView, mathHtml, mathText } from './report-model';
import { ReportRenderer, sectionNotesText } from './report-renderer';

describe('buildReportView', () => {
  const input = harrowgateReportInput();
  const e = input.revision.evaluation;
  const view = buildReportView(input);
  const lines = view.sections.flatMap((s) => s.lines);
  const line = (path: string) => {
    const found = lines.find((l) => l.path === path);
    if (!found) throw new Error(`no line for ${path}`);
    return found;
  };

  it('prints every traced result exactly once, with its registered formula and source', () => {
    expect(lines.map((l) => l.path).sort()).toEqual(Object.keys(e.trace).sort());
    for (const l of lines) {
      const formula = FORMULAS[e.trace[l.path].formula];
      expect(l.source).toBe(formula.source);
      expect(l.substitution.startsWith(`${mathText(formula.symbol)} = `)).toBe(true);
      expect(l.substitution.endsWith(l.display) || l.substitution.includes(`= ${l.display}, with `)).toBe(true);
      expect(l.substitution).not.toMatch(/undefined|NaN/);
    }
  });

  it('rounds each result to engineering figures without drifting from the stored value', () => {
    // SI value -> printed unit, from the definitions of the units (SI Brochure, 9th ed.; NIST SP 811, 2008, B.8)
    const PER_SI: Record<string, (si: number, path: string) => number> = {
      '': (x) => x, '-': (x) => x, 'N·m': (x) => x, N: (x) => x, kN: (x) => x / 1e3, mm: (x) => x * 1e3, m: (x) => x, 'mm²': (x) => x * 1e6,
      MPa: (x) => x / 1e6, kPa: (x) => x / 1e3, GPa: (x) => x / 1e9, '%': (x) => x * 100, rpm: (x) => x, W: (x) => x, kW: (x) => x / 1e3,
      '°': (x) => x, // the engine stores angles in degrees (libs/mechanics evaluate.ts)
      'm/s': (x) => x, 'm/min': (x) => x * 60, 'mm/s': (x) => x * 1e3,
      kg: (x) => x, 'kg·cm²': (x) => x * 1e4, 'rad/s²': (x) => x, 'MPa·m/s': (x) => x / 1e6, 'N·m·s²': (x) => x,
    };
    let checked = 0;
    for (const l of lines) {
      const mantissa = Number(l.value.replace('\u2212', '-').replace(/ × 10.*$/, ''));
      const exponent = / × 10(?:<sup>)?([−-]?\d+)/.exec(l.value.replace('\u2212', '-'));
      const number = exponent ? mantissa * 10 ** Number(exponent[1].replace('−', '-')) : mantissa;
      if (l.value === '—') continue; // not computed: nothing printed to compare
      const convert = PER_SI[l.unit];
      expect({ path: l.path, unit: l.unit, known: convert !== undefined }).toEqual({ path: l.path, unit: l.unit, known: true });
      const raw = convert(l.path.split('.').reduce<unknown>((node, k) => (node as Record<string, unknown>)[k], e) as number, l.path);
      expect({ path: l.path, value: l.value, number: Number.isFinite(number) }).toEqual({ path: l.path, value: l.value, number: true });
      // engineering figures (3 or 4 significant): within 0.5 % of the stored value in the printed unit
      expect({ path: l.path, off: Math.abs(number - raw) <= Math.abs(raw) * 0.005 + 1e-12 }).toEqual({ path: l.path, off: true });
      checked++;
    }
    expect(checked).toBe(lines.filter((l) => l.value !== '—').length);
    expect(line('torque.raise.atMaxFriction').value).toBe('174.0'); // 95.0 + 79.0 N*m, the substitution below
    // wiring test: the view prints the stored value through the report formatter (format.spec.ts checks the formatter on literals)
    expect(line('stresses.body.vonMises').value).toBe(formatNumber(e.stresses.body.vonMises, 'stress', 'SI'));
  });

  it('substitutes the traced inputs with units: raise torque at maximum friction', () => {
    expect(line('torque.threadRaise.atMaxFriction').substitution).toBe(
      'T_R,thread = 28.0 kN × 29.0 mm/2 × (0.16 × π × 29.0 mm + 6.00 mm × cos 14.97°) / (π × 29.0 mm × cos 14.97° − 0.16 × 6.00 mm) = 95.0 N·m',
    );
    expect(line('torque.raise.atMaxFriction').substitution).toBe('T_R = 95.0 N·m + 79.0 N·m = 174.0 N·m');
    expect(line('buckling.criticalLoad').label).toBe('Critical load (Euler)');
  });

  it('holds safety factors against the minimums the findings state', () => {
    const buckling = view.safetyFactors.find((f) => f.key === 'column-buckling');
    // Euler, C = 1.2 (Shigley 9th ed. Table 4-2 recommended, fixed-pinned), E = 207 GPa, d_r = 25 mm, L = 650 mm:
    // l/k = 104, P_cr = 1.2 pi^2 E A / 104^2 = 111.3 kN, P_cr / F = 3.97 (hand arithmetic); minimum 3.5 on lifting duty (rule set 2026.12-2)
    expect(buckling).toMatchObject({ limit: 3.5, limitText: '≥ 3.50', status: 'meets', limitFrom: 'column-buckling', valueText: '3.97' });
    const body = view.safetyFactors.find((f) => f.key === 'screw-body-yield');
    expect(body).toMatchObject({ limit: 3, status: 'meets', limitFrom: 'screw-body-yield' }); // rule-set minimum printed beside a passing check
    const pressure = view.checks.find((c) => c.ruleId === 'nut-bearing-pressure');
    // p = F / (pi d_m h n_t) = 28 kN / (pi x 29 mm x 3 mm x 20) = 5.12 MPa (Shigley 10th ed. Eq. (8-9), hand arithmetic);
    // Tr 32x6 at 90 rpm rubs at 8.2 m/min (27 ft/min): Table 8-4 hoisting screw, 800 psi low end (from memory), warned from
    // 80 % of it (rule set wear.warnPressureRatio): 640 psi = 4.41 MPa; 5.122 / 4.413 = 1.161
    expect(pressure).toMatchObject({ severity: 'warning', measured: '5.12 MPa', limit: '4.41 MPa', ratio: '1.161' });
  });

  it('groups findings by severity with the acknowledgements from the review events', () => {
    // the fixture's findings are judge() under the default rule set: three warnings, each acknowledged at approval
    expect(view.findingGroups.map((g) => [g.severity, g.findings.length])).toEqual([['blocking', 0], ['warning', 3], ['info', 0]]);
    // each acknowledgement as the review workflow writes it ({ finding, comment }), printed with who gave it
    expect(view.findingGroups[1].findings.map((f) => [f.ruleId, f.acknowledgedBy])).toEqual([
      ['nut-bearing-pressure', 'Maren Lindqvist: accepted with the grease schedule of HLS-MM-320 6.2'],
      ['drive-torque-margin', 'Maren Lindqvist: gear motor rated 220 N·m continuous, 330 N·m starting (supplier data sheet GM-220)'],
      ['nut-engaged-threads', 'Maren Lindqvist: nut kept long for wear life at this rubbing speed; the first-thread check is independent of length'],
    ]);
    expect(view.findingCounts).toEqual({ blocking: 0, warning: 3, info: 0 });
  });

  it('sets registry symbols as HTML with Greek letters, subscripts and true minus signs', () => {
    expect(mathHtml('tan alpha_n = tan alpha cos lambda')).toBe('tan α<sub>n</sub> = tan α cos λ');
    expect(mathHtml('d_3 = d - P - 2 a_c')).toBe('d<sub>3</sub> = d − P − 2 a<sub>c</sub>');
    expect(mathHtml("sigma' = sqrt(sigma^2 + 3 tau^2)")).toBe('σ&#39; = √(σ<sup>2</sup> + 3 τ<sup>2</sup>)');
    expect(mathHtml('T_R,thread <b>')).toBe('T<sub>R,thread</sub> &lt;b&gt;');
  });

  it('carries the record header, events, history and hashes', () => {
    expect(view.header).toMatchObject({ revision: 2, state: 'approved', author: 'Adaeze Okafor', reviewer: 'Maren Lindqvist', decidedAt: '2026-03-11 09:15 UTC' });
    expect(view.hash).toBe(input.revision.hash);
    expect(view.previousHash).toBe(input.revision.previousHash);
    expect(view.events.map((ev) => ev.typeLabel)).toEqual(['Revision submitted', 'Comment', 'Comment', 'Approved']);
    expect(view.events[1].text).toMatch(/grease schedule/);
    expect(view.history.map((h) => [h.revision, h.current])).toEqual([[1, false], [2, true]]);
    // by the design input's own label, the engine's value in the design's unit system (the fixture's 28 kN)
    expect(view.input.asEntered).toContainEqual({ path: 'thread.size', label: 'Standard size', value: 'Tr 32x6' });
    expect(view.input.engineUnits).toContainEqual({ path: 'load.axial', label: 'Axial load', value: '28.0 kN' });
    expect(view.input.friction[0]).toMatchObject({ range: '0.10 to 0.16', sourceKind: 'handbook' });
  });

  it('prints what was said in a decision readably: each comment with the input, finding or result it is on, each acknowledgement', () => {
    const approved = input.events.find((ev) => ev.type === 'approved')!;
    const result = input.checks.find((c) => c.value !== null)!;
    const said = {
      ...input,
      events: input.events.map((ev) => ev !== approved ? ev : {
        ...ev,
        data: {
          ...ev.data,
          comment: 'Approved for the north lift only.',
          comments: [
            { text: 'Check the nut length against the supplier drawing.', target: { field: 'nut.length' } },
            { text: 'Margin enough for the duty.', target: { result: result.id } },
          ],
          acknowledgements: [{ finding: 'nut-bearing-pressure', comment: 'Pressure accepted: the nut is replaced at every annual inspection.' }],
        },
      }),
    };
    const html = new ReportRenderer().renderHtml(buildReportView(said), { torqueFriction: null, column: null, safetyFactors: null });
    const record = html.slice(html.indexOf('class="events"')).replace(/<[^>]+>/g, ' ').replace(/\s+/g, ' ');
    expect(record).toContain('Decision comment: Approved for the north lift only.');
    expect(record).toContain('On the input “Nut length”: Check the nut length against the supplier drawing.');
    expect(record).toContain('Acknowledging the finding nut-bearing-pressure: Pressure accepted: the nut is replaced at every annual inspection.');
    // a result by the check's label with its value and limit as the check table (section 5) prints them
    const row = buildReportView(said).safetyFactors.find((f) => f.key === result.id)!;
    expect(html).toContain(`On the result “${mathHtml(result.label)}” (${row.valueText} against ${row.limitText}):</span> Margin enough for the duty.`);
    expect(record).not.toMatch(/comments: text:|target: field:|target: result:/);
  });

  it('answers a US-customary design in US units, and leaves out buckling in tension', () => {
    const us = buildReportView(harrowgateUsReportInput());
    const usLines = us.sections.flatMap((s) => s.lines);
    const units = new Set(usLines.map((l) => l.unit));
    expect([...units]).toEqual(expect.arrayContaining(['in', 'lbf·in', 'ksi', 'psi', 'hp', 'rpm', 'in/min']));
    for (const metric of ['mm', 'kN', 'MPa', 'N·m', 'W', 'm/min']) expect(units.has(metric)).toBe(false);
    expect(usLines.find((l) => l.path === 'torque.collar.atMaxFriction')?.substitution).toMatch(/^T_c = 5200 lbf × 0\.08 × 2\.25 in \/ 2 = /);
    const column = us.sections.find((s) => s.id === 'column');
    expect(column?.chart).toBeNull();
    expect(sectionNotesText(column ?? { notes: null })[0]).toMatch(/tension/);
    expect(us.unitSystemLabel).toBe('US customary');
  });
});
