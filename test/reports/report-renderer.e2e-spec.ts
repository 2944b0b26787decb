/** The calculation report rendered to HTML and to PDF in real Chromium (the run's one browser). */
import { existsSync } from 'node:fs';
import { PdfRenderer } from '../../apps/api/src/infra/pdf/browser-pool';
import { sig } from '@leadline/presentation';
import { harrowgateReportInput, HARROWGATE_INPUT } from '../../apps/api/src/reports/fixtures/harrowgate.fixture';
import { CAUTION_SHORT, CAUTION_TEXT } from '../../apps/api/src/reports/report-model';
import { ReportRenderer, reportPdfLabels, templateCompilations, type RenderedReport } from '../../apps/api/src/reports/report-renderer';
import { saveArtifact, screenshot } from '../support/artifacts';
import { pdfText } from '../support/pdf-text';
import { chromiumEndpoint } from '../support/run-resources';

const CHROMIUM = '/usr/bin/chromium';

describe('calculation report: HTML and PDF in real Chromium', () => {
  const input = harrowgateReportInput();
  const e = input.revision.evaluation;
  let pdfRenderer: PdfRenderer;
  let report: RenderedReport;
  let pdf: Buffer;
  let text: string;

  beforeAll(async () => {
    if (!existsSync(CHROMIUM)) throw new Error(`${CHROMIUM} is not installed`);
    pdfRenderer = new PdfRenderer({ executablePath: CHROMIUM, browserWSEndpoint: chromiumEndpoint() ?? undefined });
    report = await new ReportRenderer().render(input);
    pdf = await pdfRenderer.render(report.html, { format: 'A4', ...reportPdfLabels(report.view) });
    saveArtifact('report-a4.pdf', pdf);
    saveArtifact('report.html', report.html);
    text = (await pdfText(pdf)).text;
  });

  afterAll(async () => {
    await pdfRenderer?.close();
  });

  it('compiles the templates once however many reports are rendered', async () => {
    const compiled = templateCompilations();
    const again = await new ReportRenderer().render(input);
    expect(templateCompilations()).toBe(compiled);
    expect(again.html).toBe(report.html); // same record, same report
  });

  it('references nothing outside the document', () => {
    expect(report.html).not.toMatch(/\b(?:https?|ftp|file):\/\//i);
    expect(report.html).not.toMatch(/\b(?:src|href)\s*=\s*["']?(?!data:|#)/i);
    expect(report.html).not.toMatch(/url\(\s*['"]?(?!data:|#)/i);
    expect(report.html).not.toMatch(/@import|@font-face/i);
  });

  it('prints no long run of decimals anywhere in the HTML', () => {
    const textOnly = report.html
      .replace(/<style[\s\S]*?<\/style>/g, '')
      .replace(/<[^>]+>/g, ' ')
      .replace(/1 lbf (=|&#x3D;) 4\.4482216152605 N/, ''); // the exact definition, quoted on purpose in the conventions
    expect(textOnly).not.toMatch(/\d\.\d{6,}/);
  });

  it('carries the safety caution near the top and again at the end, and the footer on every page', () => {
    const first = report.html.indexOf(CAUTION_TEXT[0]);
    expect(first).toBeGreaterThan(0);
    expect(first).toBeLessThan(report.html.indexOf('<h2'));
    expect(report.html.lastIndexOf(CAUTION_TEXT[0])).toBeGreaterThan(report.html.indexOf('Record integrity'));
    for (const sentence of CAUTION_TEXT) expect(text).toContain(sentence);
    expect(text).toContain(CAUTION_SHORT);
  });

  it('PDF: header of the record (product, calculation, revision, state, people, hash)', () => {
    expect(text).toContain('HLS-MP-320');
    expect(text).toContain(input.calculation.title);
    expect(text).toContain(input.calculation.id);
    expect(text).toContain('Approved');
    expect(text).toContain('Adaeze Okafor');
    expect(text).toContain('Maren Lindqvist');
    expect(text).toContain('2026-03-11 09:15 UTC');
    // the hash wraps inside its cell: compare without whitespace
    const compact = text.replace(/\s/g, '');
    expect(compact).toContain(input.revision.hash);
    expect(compact).toContain(input.revision.previousHash as string);
  });

  it('PDF: key inputs as entered and as the engine used them, with friction sources', () => {
    expect(text).toContain(HARROWGATE_INPUT.thread.size);
    expect(text).toContain(HARROWGATE_INPUT.load.axial);
    expect(text).toContain(HARROWGATE_INPUT.screw.unsupportedLength);
    expect(text).toContain('thread/steel-bronze/oil');
    expect(text).toContain('Harrowgate bench test HLS-TR-117');
    expect(text).toContain('0.10 to 0.16');
    // the values the engine used, by label in the design's unit system (28 kN entered, 28 000 N in the engine)
    expect(text).toMatch(/2\.2 Values the engine used[\s\S]*Axial load load\.axial 28\.0 kN/);
  });

  it('PDF: results as the view formats them, and those match the stored evaluation', () => {
    const lines = report.view.sections.flatMap((s) => s.lines);
    const line = (path: string) => {
      const found = lines.find((l) => l.path === path);
      if (!found) throw new Error(`no line for ${path}`);
      return found;
    };
    const expected: [string, number][] = [
      ['torque.raise.atMaxFriction', e.torque.raise.atMaxFriction],
      ['torque.raise.atMinFriction', e.torque.raise.atMinFriction],
      ['torque.lower.atMinFriction', e.torque.lower.atMinFriction],
      ['selfLocking.margin', e.selfLocking.margin],
      ['buckling.safetyFactor', e.buckling.safetyFactor as number],
      ['drive.margin', (e.drive as { margin: number }).margin],
    ];
    // Independent figures first (hand arithmetic on the fixture): T_R,max = 95.0 + 79.0 = 174.0 N*m (the substitution below);
    // drive margin 220 / 174.0 = 1.265; self-locking margin 0.10 / (cos 14.97 deg x tan 3.77 deg) = 1.572;
    // Euler P_cr / F = 1.2 pi^2 x 207 GPa x 490.9 mm^2 / 104^2 / 28 kN = 3.97 (Shigley 9th ed. Table 4-2, C = 1.2)
    expect(line('torque.raise.atMaxFriction').display).toBe('174.0 N·m');
    expect(line('drive.margin').value).toBe('1.265');
    expect(line('selfLocking.margin').value).toBe('1.572');
    expect(line('buckling.safetyFactor').value).toBe('3.97');
    // Wiring test from here on: the PDF prints the view's values, which round the stored evaluation
    for (const [path, raw] of expected) {
      const l = line(path);
      expect(l.value).toBe(sig(raw)); // torques in N·m, ratios plain: SI display of these equals the raw value
      expect(Math.abs(Number(l.value) - raw) / raw).toBeLessThan(0.005);
      expect(text).toContain(l.display);
    }
    // stresses in MPa, lengths in mm
    expect(line('stresses.body.vonMises').display).toBe(`${sig(e.stresses.body.vonMises / 1e6)} MPa`);
    expect(text).toContain(line('stresses.body.vonMises').display);
    expect(line('geometry.minorDiameter').display).toBe(`${sig(e.geometry.minorDiameter * 1000)} mm`);
    expect(text).toContain(line('buckling.criticalLoad').display);
    // a substitution line, with the inputs in place
    expect(text).toContain('28.0 kN × 29.0 mm/2 × (0.16 × π × 29.0 mm + 6.00 mm × cos 14.97°)');
  });

  it('PDF: every finding message, grouped by severity, with the review comments', () => {
    for (const f of input.revision.findings) expect(text).toContain(f.message);
    expect(text).toContain('Warnings (3)');
    expect(text).toContain('Information (0)');
    expect(text).toContain('Blocking findings (0)');
    expect(text).toContain('Is the grease schedule in the maintenance manual?');
    expect(text).toContain('Acknowledged by Maren Lindqvist');
  });

  it('lays out within an A4 page width (794 px): no element wider than its box (screenshot with ARTIFACTS=1)', async () => {
    const result = await pdfRenderer.withPage(async (page) => {
      await page.setViewport({ width: 794, height: 1123 });
      try {
        await page.setContent(report.html, { waitUntil: 'load' });
        const out: Record<string, { page: number; viewport: number; offenders: string[] }> = {};
        for (const media of ['screen', 'print'] as const) {
          await page.emulateMediaType(media);
          if (media === 'screen') {
            await screenshot(page, 'report-a4');
            await screenshot(page, 'report-a4-first-screen', { fullPage: false });
          }
          out[media] = await page.evaluate(() => {
            const offenders: string[] = [];
            const pageWidth = document.documentElement.clientWidth;
            for (const el of Array.from(document.querySelectorAll('body *'))) {
              const name = `${el.tagName.toLowerCase()}${el.id ? `#${el.id}` : ''}${el instanceof HTMLElement && el.className ? `.${el.className}` : ''}`;
              if (el instanceof HTMLElement && el.clientWidth > 0 && el.scrollWidth > el.clientWidth + 1) offenders.push(`${name}: content ${el.scrollWidth} > box ${el.clientWidth}`);
              const right = el.getBoundingClientRect().right;
              if (right > pageWidth + 0.5) offenders.push(`${name} ends at ${right} > ${pageWidth}`);
            }
            // chart labels must stay inside their chart
            for (const svg of Array.from(document.querySelectorAll('svg'))) {
              const frame = svg.getBoundingClientRect();
              for (const t of Array.from(svg.querySelectorAll('text'))) {
                const r = t.getBoundingClientRect();
                if (r.width > 0 && (r.left < frame.left - 0.5 || r.right > frame.right + 0.5)) offenders.push(`svg text "${t.textContent}" outside its chart`);
              }
            }
            return { page: document.documentElement.scrollWidth, viewport: document.documentElement.clientWidth, offenders };
          });
        }
        return out;
      } finally {
        await page.emulateMediaType();
        await page.setViewport({ width: 800, height: 600 });
      }
    });
    for (const media of ['screen', 'print']) {
      expect(result[media].offenders).toEqual([]);
      expect(result[media].page).toBeLessThanOrEqual(794);
    }
  });

  it('renders as US Letter too', async () => {
    const letter = await pdfRenderer.render(report.html, { format: 'Letter', ...reportPdfLabels(report.view) });
    expect(/\/MediaBox\s*\[\s*0 0 612 792\s*\]/.test(letter.toString('latin1'))).toBe(true);
    const t = (await pdfText(letter)).text;
    expect(t).toContain(input.revision.findings[1].message);
  });
});
