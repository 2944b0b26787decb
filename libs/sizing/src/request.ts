/**
 * Validates a sizing request and turns it into what the search needs: the requirements in engine units (checked
 * once, with the design input's own conversion), the search space, and a builder of each candidate's design input.
 * Pure: no I/O.
 */
import {
  parseDesign,
  sizingRequestSchema,
  SIZING_DEFAULTS,
  type DesignInput,
  type FieldIssue,
  type SizingForm,
  type SizingObjective,
  type SizingRequirements,
  type Verdict,
} from '@leadline/contracts';
import { INCH, iso2903Row, MM, parseQuantity, QuantityError, THREAD_SIZES, TOLERANCE_CLASSES, type Design, type ThreadSize } from '@leadline/mechanics';
import type { z } from 'zod';

export interface SizingPlan {
  readonly requirements: SizingRequirements;
  /** The requirements in engine units, with a placeholder thread, nut length and collar the search replaces */
  readonly base: Design;
  /** Collar mean diameter = ratio x major diameter, or null when the collar is fixed by the requirements */
  readonly collarRatio: number | null;
  /** requirements.nut.outsideDiameterRatio: the nut body's outside diameter as a multiple of the major diameter, or null */
  readonly nutOutsideRatio: number | null;
  readonly sizes: readonly ThreadSize[];
  readonly starts: readonly number[];
  readonly nutLengthRatios: readonly number[];
  readonly objective: SizingObjective;
  readonly limit: number;
  /** Verdicts a listed candidate may have (search.verdicts); null lists every passing candidate */
  readonly verdicts: readonly Verdict[] | null;
  /** Tolerance class by thread form (search.toleranceClass); a form without one uses the basic profile */
  readonly toleranceClass: Readonly<Partial<Record<SizingForm, string>>>;
}

export type SizingParseResult =
  | { readonly success: true; readonly plan: SizingPlan }
  | { readonly success: false; readonly issues: readonly FieldIssue[] };

type ZodIssue = z.core.$ZodIssue;

/**
 * Flattens zod issues for people: inside a choice (union) the branch that came closest (fewest issues) speaks, so
 * the message names the leaf field ("requirements.collar.meanDiameterRatio: ...") instead of "Invalid input".
 */
export function readableIssues(issues: readonly ZodIssue[], prefix: readonly PropertyKey[] = []): FieldIssue[] {
  const out: FieldIssue[] = [];
  for (const i of issues) {
    const path = [...prefix, ...i.path];
    if (i.code === 'invalid_union' && i.errors.length > 0) {
      const closest = [...i.errors].sort((a, b) => a.length - b.length)[0];
      out.push(...readableIssues(closest, path));
      continue;
    }
    out.push({ path: path.map(String).join('.') || '(body)', message: i.message });
  }
  return out;
}

/** Unit a candidate's lengths are written in: inches for inch series, millimetres for metric ones. */
function lengthUnit(size: ThreadSize): { unit: 'in' | 'mm'; si: number } {
  return /ACME|UNC/.test(size.designation) ? { unit: 'in', si: INCH } : { unit: 'mm', si: MM };
}

/** A length as a design writes it, in the size's own unit, without float noise ("54 mm", "1.875 in"). */
export function lengthText(metres: number, size: ThreadSize): string {
  const { unit, si } = lengthUnit(size);
  return `${Number((metres / si).toPrecision(12))} ${unit}`;
}

/** The design input of one candidate: the requirements as given, with the size, starts, nut length and collar filled in. */
export function candidateInput(plan: SizingPlan, size: ThreadSize, starts: number, nutLengthRatio: number): DesignInput {
  const r = plan.requirements;
  const collar: DesignInput['collar'] =
    'meanDiameterRatio' in r.collar
      ? { kind: r.collar.kind, meanDiameter: lengthText(r.collar.meanDiameterRatio * size.majorDiameter, size) }
      : r.collar;
  const toleranceClass = plan.toleranceClass[size.form as SizingForm];
  return {
    thread: { form: size.form, size: size.designation, starts, ...(toleranceClass ? { toleranceClass } : {}) },
    load: r.load,
    friction: r.friction,
    collar,
    nut: nutInput(r.nut, lengthText(nutLengthRatio * size.majorDiameter, size), (ratio) => lengthText(ratio * size.majorDiameter, size)),
    screw: r.screw,
    duty: r.duty,
    ...(r.drive ? { drive: r.drive } : {}),
  } as DesignInput;
}

/** A design's nut from the requirements' nut: the length given, the outside-diameter ratio turned into a length. */
function nutInput(nut: SizingRequirements['nut'], length: string, lengthOf: (ratio: number) => string): DesignInput['nut'] {
  const { outsideDiameterRatio, ...rest } = nut;
  return { length, ...rest, ...(outsideDiameterRatio !== undefined ? { outsideDiameter: lengthOf(outsideDiameterRatio) } : {}) } as DesignInput['nut'];
}

/** Where a design-input field sits in the sizing request. */
function requestPath(designPath: string): string {
  if (designPath.startsWith('collar.meanDiameter')) return 'requirements.collar.meanDiameterRatio';
  if (designPath === 'nut.outsideDiameter') return 'requirements.nut.outsideDiameterRatio';
  return `requirements.${designPath}`;
}

/** A probe thread that fits any requirement (its size never reaches the answer). */
const PROBE = { form: 'trapezoidal' as const, majorDiameter: '100 mm', pitch: '10 mm' };

/** Validates a raw request; never throws on bad input. Field paths are those of the request body. */
export function parseSizingRequest(raw: unknown): SizingParseResult {
  const shape = sizingRequestSchema.safeParse(raw);
  if (!shape.success) return { success: false, issues: readableIssues(shape.error.issues) };
  const { requirements, search = {} } = shape.data;
  const issues: FieldIssue[] = [];

  // The requirement values are converted exactly as a design's are, on a probe design; errors map back to their field.
  const collarRatio = 'meanDiameterRatio' in requirements.collar ? requirements.collar.meanDiameterRatio : null;
  const probe = {
    thread: PROBE,
    load: requirements.load,
    friction: requirements.friction,
    collar: collarRatio === null ? requirements.collar : { kind: requirements.collar.kind, meanDiameter: `${collarRatio * 100} mm` },
    nut: nutInput(requirements.nut, '200 mm', (ratio) => `${ratio * 100} mm`),
    screw: requirements.screw,
    duty: requirements.duty,
    ...(requirements.drive ? { drive: requirements.drive } : {}),
  };
  const parsed = parseDesign(probe);
  if (!parsed.success) {
    for (const i of parsed.issues) issues.push({ path: requestPath(i.path), message: i.message });
  }

  const diameter = (text: string | undefined, path: string): number | null => {
    if (text === undefined) return null;
    const q = parseQuantity(text, 'length');
    if (q instanceof QuantityError) {
      issues.push({ path, message: q.message });
      return null;
    }
    if (!(q.si > 0)) {
      issues.push({ path, message: `must be greater than zero, got "${text}"` });
      return null;
    }
    return q.si;
  };
  const dMin = diameter(search.majorDiameter?.min, 'search.majorDiameter.min');
  const dMax = diameter(search.majorDiameter?.max, 'search.majorDiameter.max');
  if (dMin !== null && dMax !== null && dMin > dMax) issues.push({ path: 'search.majorDiameter.min', message: 'min must not exceed max' });

  const toleranceClass: Partial<Record<SizingForm, string>> = {};
  for (const [form, cls] of Object.entries(search.toleranceClass ?? {}) as [SizingForm, string | undefined][]) {
    if (cls === undefined) continue;
    const held = TOLERANCE_CLASSES[form] ?? [];
    if (!held.includes(cls)) issues.push({ path: `search.toleranceClass.${form}`, message: `${form} threads take one of ${held.map((c) => `"${c}"`).join(', ')}` });
    else toleranceClass[form] = cls;
  }

  if (issues.length > 0 || !parsed.success) return { success: false, issues };

  const forms = new Set<SizingForm>(search.forms ?? SIZING_DEFAULTS.forms);
  const tolerance = 1e-9;
  const sizes = THREAD_SIZES.filter(
    (s) =>
      forms.has(s.form as SizingForm) &&
      // a trapezoidal class can only be judged on sizes whose ISO 2903 limits are held
      (s.form !== 'trapezoidal' || toleranceClass.trapezoidal === undefined || iso2903Row(s.majorDiameter, s.pitch) !== undefined) &&
      (dMin === null || s.majorDiameter >= dMin - tolerance) &&
      (dMax === null || s.majorDiameter <= dMax + tolerance),
  );
  const unique = <T>(xs: readonly T[]) => [...new Set(xs)];
  return {
    success: true,
    plan: {
      requirements,
      base: parsed.design,
      collarRatio,
      nutOutsideRatio: requirements.nut.outsideDiameterRatio ?? null,
      sizes,
      starts: unique(search.starts ?? SIZING_DEFAULTS.starts).sort((a, b) => a - b),
      nutLengthRatios: unique(search.nutLength?.ratios ?? SIZING_DEFAULTS.nutLengthRatios).sort((a, b) => a - b),
      objective: search.objective ?? SIZING_DEFAULTS.objective,
      limit: search.limit ?? SIZING_DEFAULTS.limit,
      verdicts: search.verdicts ? unique(search.verdicts as Verdict[]) : null,
      toleranceClass,
    },
  };
}
