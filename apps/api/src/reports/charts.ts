/**
 * Report charts, drawn on the server as SVG: vega-lite spec -> vega view (renderer 'none') -> toSVG().
 * The series are read from the revision's stored evaluation and formula trace (libs/mechanics chart-series.ts), so a
 * chart shows what the revision's own engine computed and never disagrees with the tabulated results. Only the loaded vega modules are cached; nothing that depends on a revision is.
 */
import type { RevisionRecord } from '@leadline/contracts';
import { columnCurveFromTrace, torqueSweepFromTrace, type ColumnCurve, type Design, type Evaluation, type TorqueSweep } from '@leadline/mechanics';
import { coefficient, sig, toDisplay, unitSymbol, type UnitSystem } from '@leadline/presentation';
import type { ReportView, SafetyFactorRow } from './report-model';

// ---------------------------------------------------------------------------------------------------------
// Loading vega from CommonJS

type VegaModule = typeof import('vega');
/** The one vega-lite function used (its types do not resolve under moduleResolution node10). */
interface VegaLiteModule {
  compile(spec: Record<string, unknown>): { spec: import('vega').Spec };
}

/**
 * vega and vega-lite are ESM with top-level await, so require() cannot load them. With "module": "commonjs"
 * tsc rewrites a literal import() into require(); an import() built by the Function constructor is left alone
 * and works both in compiled output and under Jest (--experimental-vm-modules).
 */
// The unique comment keeps V8 from reusing one compiled function across Jest test files (its cached script would
// import through the first file's torn-down module loader).
const nativeImport = new Function('specifier', `return import(specifier); /* ${Math.random()} */`) as <T>(specifier: string) => Promise<T>;

let modules: Promise<{ vega: VegaModule; vl: VegaLiteModule }> | null = null;
function loadVega(): Promise<{ vega: VegaModule; vl: VegaLiteModule }> {
  // One after the other: Jest's ESM loader fails on two concurrent imports that share dependencies.
  modules ??= (async () => {
    const vega = await nativeImport<VegaModule>('vega');
    const vl = await nativeImport<VegaLiteModule>('vega-lite');
    return { vega, vl };
  })();
  modules.catch(() => (modules = null));
  return modules;
}

// ---------------------------------------------------------------------------------------------------------
// Specs

const FONT = 'DejaVu Sans, Liberation Sans, sans-serif';
const WIDTH = 560;
const INK = '#1d2733';
const COLORS = { raise: '#1f5fa8', lower: '#b3471d', thread: '#7a5b9a', band: '#9fb8d6', rule: '#2f6b3a', bad: '#b3261e', ok: '#2f6b3a', none: '#8a8f96' };

const baseConfig = {
  font: FONT,
  // No ARIA attributes: they repeat every datum unrounded; the figure caption describes the chart.
  aria: false,
  background: '#ffffff',
  view: { stroke: '#c4c9cf' },
  axis: { labelFontSize: 10, titleFontSize: 10.5, titleFontWeight: 'normal', labelColor: INK, titleColor: INK, gridColor: '#e6e9ec', domainColor: '#69727d', tickColor: '#69727d' },
  legend: { labelFontSize: 10, titleFontSize: 10, orient: 'bottom', direction: 'horizontal', symbolStrokeWidth: 2, labelLimit: 280, columnPadding: 18 },
  text: { font: FONT },
};

type Spec = Record<string, unknown>;

export function torqueFrictionSpec(sweep: TorqueSweep, system: UnitSystem): Spec {
  const t = (si: number) => toDisplay(si, 'torque', system);
  const unit = unitSymbol('torque', system);
  const SERIES = ['Raise, thread + collar', 'Lower, thread + collar', 'Lower, thread alone'];
  const values = sweep.points.flatMap((p) => [
    { f: p.f, series: SERIES[0], torque: t(p.raise) },
    { f: p.f, series: SERIES[1], torque: t(p.lower) },
    { f: p.f, series: SERIES[2], torque: t(p.lowerThread) },
  ]);
  const ends = sweep.points.filter((p) => p.f === sweep.range.min || p.f === sweep.range.max);
  const marks = ends.flatMap((p) => [
    { f: p.f, torque: t(p.raise), label: sig(t(p.raise)) },
    { f: p.f, torque: t(p.lower), label: sig(t(p.lower)) },
  ]);
  const x = { field: 'f', type: 'quantitative', title: 'Thread friction coefficient f', scale: { domain: [0, sweep.points[sweep.points.length - 1].f], nice: false } };
  return {
    width: WIDTH,
    height: 250,
    config: baseConfig,
    layer: [
      {
        data: { values: [{ a: sweep.range.min, b: sweep.range.max }] },
        mark: { type: 'rect', color: COLORS.band, opacity: 0.35 },
        encoding: { x: { field: 'a', type: 'quantitative', scale: x.scale }, x2: { field: 'b' } },
      },
      {
        data: { values: [{ a: (sweep.range.min + sweep.range.max) / 2, label: `design range ${coefficient(sweep.range.min)}–${coefficient(sweep.range.max)}` }] },
        mark: { type: 'text', baseline: 'top', dy: 4, y: 0, fontSize: 9.5, color: '#3d5a80' },
        encoding: { x: { field: 'a', type: 'quantitative' }, text: { field: 'label' } },
      },
      {
        data: { values: [{ y: 0 }] },
        mark: { type: 'rule', color: '#69727d', strokeWidth: 1 },
        encoding: { y: { field: 'y', type: 'quantitative' } },
      },
      {
        data: { values },
        mark: { type: 'line', strokeWidth: 2, clip: true },
        encoding: {
          x,
          y: { field: 'torque', type: 'quantitative', title: `Torque [${unit}]` },
          color: { field: 'series', type: 'nominal', title: null, scale: { domain: SERIES, range: [COLORS.raise, COLORS.lower, COLORS.thread] } },
          strokeDash: { field: 'series', type: 'nominal', title: null, scale: { domain: SERIES, range: [[1, 0], [1, 0], [5, 3]] } },
        },
      },
      {
        data: { values: marks },
        mark: { type: 'point', filled: true, size: 36, color: INK },
        encoding: { x: { field: 'f', type: 'quantitative' }, y: { field: 'torque', type: 'quantitative' } },
      },
      {
        data: { values: [{ f: sweep.boundaryFriction, label: `self-locking boundary f = cos αₙ tan λ = ${sig(sweep.boundaryFriction)}` }] },
        layer: [
          { mark: { type: 'rule', color: COLORS.rule, strokeWidth: 1.5, strokeDash: [6, 3] }, encoding: { x: { field: 'f', type: 'quantitative' } } },
          {
            mark: { type: 'text', align: 'left', baseline: 'bottom', dx: 4, y: 'height', dy: -4, fontSize: 9.5, color: COLORS.rule },
            encoding: { x: { field: 'f', type: 'quantitative' }, text: { field: 'label' } },
          },
        ],
      },
    ],
    resolve: { scale: { color: 'independent', strokeDash: 'independent' } },
  };
}

export function columnSpec(curve: ColumnCurve, system: UnitSystem): Spec {
  const s = (si: number) => toDisplay(si, 'stress', system);
  const unit = unitSymbol('stress', system);
  const SERIES = ['Johnson parabola', 'Euler hyperbola', 'Euler, not governing'];
  const values = [
    ...curve.johnson.map((p) => ({ s: p.s, stress: s(p.stress), series: SERIES[0] })),
    ...curve.euler.map((p) => ({ s: p.s, stress: s(p.stress), series: SERIES[1] })),
    ...curve.eulerBelow.map((p) => ({ s: p.s, stress: s(p.stress), series: SERIES[2] })),
  ];
  const points = [
    { s: curve.design.s, stress: s(curve.design.stress), label: `design F/A = ${sig(s(curve.design.stress))} ${unit}` },
    { s: curve.critical.s, stress: s(curve.critical.stress), label: `critical P_cr/A = ${sig(s(curve.critical.stress))} ${unit}` },
  ];
  const xDomain = [0, curve.euler[curve.euler.length - 1].s];
  return {
    width: WIDTH,
    height: 240,
    config: baseConfig,
    layer: [
      {
        data: { values },
        mark: { type: 'line', strokeWidth: 2, clip: true },
        encoding: {
          x: { field: 's', type: 'quantitative', title: 'Slenderness ratio l/k', scale: { domain: xDomain, nice: false } },
          y: { field: 'stress', type: 'quantitative', title: `Critical stress P_cr/A [${unit}]`, scale: { domain: [0, s(curve.yieldStrength) * 1.1], nice: false } },
          color: { field: 'series', type: 'nominal', title: null, scale: { domain: SERIES, range: [COLORS.raise, COLORS.lower, '#b7a79e'] } },
          strokeDash: { field: 'series', type: 'nominal', title: null, scale: { domain: SERIES, range: [[1, 0], [1, 0], [4, 3]] } },
        },
      },
      {
        data: { values: [{ s: curve.transition, label: `(l/k)₁ = ${sig(curve.transition)}` }] },
        layer: [
          { mark: { type: 'rule', color: '#69727d', strokeDash: [3, 3] }, encoding: { x: { field: 's', type: 'quantitative' } } },
          { mark: { type: 'text', align: 'left', dx: 4, y: 10, fontSize: 9.5, color: '#4a525c' }, encoding: { x: { field: 's', type: 'quantitative' }, text: { field: 'label' } } },
        ],
      },
      {
        data: { values: [{ s: curve.design.s, a: s(curve.design.stress), b: s(curve.critical.stress) }] },
        mark: { type: 'rule', color: INK, strokeDash: [2, 2] },
        encoding: { x: { field: 's', type: 'quantitative' }, y: { field: 'a', type: 'quantitative' }, y2: { field: 'b' } },
      },
      {
        data: { values: points },
        layer: [
          { mark: { type: 'point', filled: true, size: 50, color: INK }, encoding: { x: { field: 's', type: 'quantitative' }, y: { field: 'stress', type: 'quantitative' } } },
          {
            mark: { type: 'text', align: 'left', dx: 7, dy: -6, fontSize: 9.5, color: INK },
            encoding: { x: { field: 's', type: 'quantitative' }, y: { field: 'stress', type: 'quantitative' }, text: { field: 'label' } },
          },
        ],
      },
    ],
  };
}

export function safetyFactorSpec(rows: readonly SafetyFactorRow[]): Spec | null {
  // Factors against minimums only (shares of an allowable are read in the table)
  const shown = rows.filter((r) => r.value !== null && r.limitKind === 'minimum');
  if (shown.length === 0) return null;
  const limits = shown.map((r) => r.limit ?? 0);
  // Large factors (stripping is often 20+) would flatten the rest: cap the axis and print the true value.
  const cap = Math.max(5, Math.ceil(Math.max(...limits) * 2.5));
  const values = shown.map((r) => ({
    label: r.shortLabel,
    value: Math.min(r.value as number, cap),
    text: `${r.valueText}  (min ${r.limitText.replace(/^≥ /, '')})`,
    limit: r.limit,
    status: r.status === 'below' ? 'below the minimum' : r.status === 'warning' ? 'past the warning level' : 'meets the minimum',
  }));
  // The legend lists only the statuses that occur, in a fixed order and colour
  const ALL_STATUS: readonly [string, string][] = [['meets the minimum', COLORS.ok], ['past the warning level', COLORS.none], ['below the minimum', COLORS.bad]];
  const present = ALL_STATUS.filter(([status]) => values.some((v) => v.status === status));
  const y = { field: 'label', type: 'nominal', title: null, sort: null, axis: { labelLimit: 200, labelFontSize: 10 } };
  return {
    width: 400,
    height: { step: 24 },
    config: baseConfig,
    data: { values },
    layer: [
      {
        mark: { type: 'bar', height: 14 },
        encoding: {
          y,
          x: { field: 'value', type: 'quantitative', title: 'Safety factor (axis capped; true values printed)', scale: { domain: [0, cap], nice: false } },
          color: { field: 'status', type: 'nominal', title: null, scale: { domain: present.map(([status]) => status), range: present.map(([, colour]) => colour) } },
        },
      },
      {
        transform: [{ filter: 'datum.limit != null' }],
        mark: { type: 'tick', color: INK, thickness: 2.5, size: 22 },
        encoding: { y, x: { field: 'limit', type: 'quantitative' } },
      },
      {
        mark: { type: 'text', align: 'left', dx: 5, fontSize: 9.5, color: INK },
        encoding: { y, x: { field: 'value', type: 'quantitative' }, text: { field: 'text' } },
      },
    ],
  };
}

// ---------------------------------------------------------------------------------------------------------
// Rendering

/** Lets queued I/O callbacks (other requests, /health) run before the next synchronous step. */
export const yieldToEventLoop = (): Promise<void> => new Promise((resolve) => setImmediate(resolve));

/**
 * Compiles a vega-lite spec and renders it headless to an SVG string fit to inline in HTML.
 * @param idPrefix - prefix of the SVG's internal ids (clip paths), unique per chart within one document
 */
export async function specToSvg(spec: Spec, idPrefix: string, label: string): Promise<string> {
  const { vega, vl } = await loadVega();
  const compiled = vl.compile(spec).spec;
  await yieldToEventLoop();
  const view = new vega.View(vega.parse(compiled), { renderer: 'none' });
  try {
    const svg = await view.toSVG();
    // vega numbers clip paths with a process-wide counter; renumber them per chart so the same revision
    // always gives the same document and two charts in one page never share an id.
    const ids = new Map<string, string>();
    const local = (id: string): string => {
      if (!ids.has(id)) ids.set(id, `${idPrefix}-clip-${ids.size + 1}`);
      return ids.get(id) as string;
    };
    return (
      svg
        // Inline SVG needs no namespace declarations; dropping them keeps every URL out of the document.
        .replace(/\s+xmlns(:xlink)?="[^"]*"/g, '')
        .replace(/id="(clip\d+)"/g, (_m, id: string) => `id="${local(id)}"`)
        .replace(/url\(#(clip\d+)\)/g, (_m, id: string) => `url(#${local(id)})`)
        // One image with one name: the roles vega still gives some mark groups (graphics-symbol) would each need a
        // name of their own (axe svg-img-alt); the chart is described by its label and its figure caption
        .replace(/\s(?:role|aria-roledescription)="[^"]*"/g, '')
        .replace(/<svg /, `<svg role="img" aria-label="${label.replace(/[&<>"]/g, '')}" `)
    );
  } finally {
    view.finalize();
  }
}

export interface ReportCharts {
  /** null when the stored trace lacks the torque entries (nothing is drawn that the revision's engine did not record) */
  readonly torqueFriction: string | null;
  readonly column: string | null;
  readonly safetyFactors: string | null;
}

/** The report's three charts for one revision, rendered fresh each time. */
export async function renderReportCharts(revision: RevisionRecord, view: ReportView, idPrefix = ''): Promise<ReportCharts> {
  const sfSpec = safetyFactorSpec(view.safetyFactors);
  // One chart after the other, yielding to the event loop between them: a report never holds the loop for
  // longer than one chart's layout, so /health and other requests are served in between.
  const design = await renderDesignCharts(revision.normalized, revision.evaluation, view.unitSystem, idPrefix);
  await yieldToEventLoop();
  const safetyFactors = sfSpec ? await specToSvg(sfSpec, `${idPrefix}factors`, 'Safety factors against their minimums') : null;
  return { ...design, safetyFactors };
}

/** The torque-friction chart and the column chart of any evaluated design, saved or not (the report's own charts). */
export async function renderDesignCharts(design: Design, e: Evaluation, system: UnitSystem, idPrefix = ''): Promise<Omit<ReportCharts, 'safetyFactors'>> {
  const curve = columnCurveFromTrace(e, design.load.axial);
  const sweep = torqueSweepFromTrace(e);
  const torqueFriction = sweep === null ? null : await specToSvg(torqueFrictionSpec(sweep, system), `${idPrefix}torque`, 'Torque against thread friction');
  await yieldToEventLoop();
  const column = curve ? await specToSvg(columnSpec(curve, system), `${idPrefix}column`, 'Column curve with the design point') : null;
  return { torqueFriction, column };
}
