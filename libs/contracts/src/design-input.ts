/**
 * The design input contract: JSON with unit strings, validated with zod, converted once to engine units.
 * Field names are a contract (see the engine issue): add fields, never rename.
 */
import {
  END_CONDITIONS,
  THREAD_FORMS,
  findFrictionEntry,
  findNutMaterial,
  findScrewMaterial,
  findThreadSize,
  parseQuantity,
  QuantityError,
  BUTTRESS_PROFILES,
  TOLERANCE_CLASSES,
  HOISTING_CLASSES,
  threadGeometry,
  iso2903Row,
  DIMENSION_HINT,
  type Design,
  type Dimension,
  type FrictionRange,
  type PressureSpeedPoint,
} from '@leadline/mechanics';
import { z } from 'zod';

/**
 * A "<number> <unit>" string of one dimension. The schema checks the shape; the unit, dimension and sign are
 * checked once, while converting, in normalizeDesign (one parse per value per request).
 */
function quantity(dimension: Dimension, description: string) {
  const schema = z.string().max(64).describe(`${description}: ${DIMENSION_HINT[dimension]}`);
  FIELD_DIMENSION.set(schema, dimension);
  return schema;
}

/** The dimension of each quantity field of the design input, kept by its schema (read by designFieldDimension). */
const FIELD_DIMENSION = new WeakMap<z.ZodType, Dimension>();

const length = (d: string) => quantity('length', d);
const coefficient = z.number().min(0, 'friction coefficient must be within 0..1').max(1, 'friction coefficient must be within 0..1');
const lowest = coefficient.describe('lowest friction coefficient of the range');
const highest = coefficient.describe('highest friction coefficient of the range');

export const frictionSourceSchema = z.strictObject({
  kind: z.enum(['handbook', 'test', 'supplier', 'assumed']).describe('kind of friction source: handbook, test, supplier or assumed'),
  reference: z.string().min(1, 'name the handbook, test report or supplier document').max(500).describe('friction source reference: the handbook, test report or supplier document'),
});

/** A friction range typed in, or a reference to a friction-library entry. */
export const frictionRangeSchema = z.union([
  z.strictObject({ min: lowest, max: highest, source: frictionSourceSchema }),
  z.strictObject({ entry: z.string().min(1).max(100).describe('id of a friction-library entry (GET /api/v1/friction-sources)') }),
]);

const collarAllowable = () => quantity('stress', 'allowable mean bearing pressure of the collar pair (from the handbook or supplier)').optional();

export const collarSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('plain').describe('thrust collar type'), meanDiameter: length('collar mean diameter'), allowablePressure: collarAllowable() }),
  z.strictObject({
    kind: z.literal('annular').describe('thrust collar type'),
    outerDiameter: length('collar outer diameter'),
    innerDiameter: length('collar inner diameter'),
    model: z.enum(['uniform-wear', 'uniform-pressure']).describe('collar friction model'),
    allowablePressure: collarAllowable(),
  }),
  z.strictObject({
    kind: z.literal('rolling').describe('thrust collar type'),
    meanDiameter: length('bearing mean diameter'),
    dynamicRating: quantity('force', 'basic dynamic axial load rating C_a from the bearing data').optional(),
    staticRating: quantity('force', 'basic static axial load rating C_0a from the bearing data').optional(),
    rollingElement: z.enum(['ball', 'roller']).optional().describe('rolling elements: "ball" (life exponent 3) or "roller" (10/3, the default)'),
    ratingSource: z.string().min(1).max(500).optional().describe('where the ratings come from: catalogue, designation, page'),
  }),
  z.strictObject({ kind: z.literal('none').describe('thrust collar type') }),
]);

export const designInputSchema = z.strictObject({
  thread: z.strictObject({
    form: z.enum(THREAD_FORMS).describe('thread form'),
    size: z.string().max(40).optional().describe('standard size, e.g. "Tr 24x5", "1-1/2-4 ACME", "M20" (GET /api/v1/thread-sizes)'),
    majorDiameter: length('major (nominal) diameter').optional(),
    pitch: length('pitch (axial distance between adjacent threads)').optional(),
    starts: z.number().int('starts must be a whole number').min(1, 'starts must be at least 1').max(12).optional().describe('number of thread starts (default 1)'),
    loadFlankAngle: z.union([z.number(), quantity('angle', 'load-flank angle')]).optional().describe('buttress only: 3 or 7 deg'),
    toleranceClass: z
      .string()
      .max(20)
      .optional()
      .describe('tolerance class, nut/screw: "7H/7e" (ISO 2903, trapezoidal) or "2G", "3G", "4G" (ASME B1.5, Acme); the checks then use its minimum-material diameters'),
  }),
  load: z.strictObject({ axial: quantity('force', 'axial load'), sense: z.enum(['compression', 'tension']).describe('load sense in the screw') }),
  friction: z.strictObject({ thread: frictionRangeSchema, collar: frictionRangeSchema.optional() }),
  collar: collarSchema,
  nut: z.strictObject({
    length: length('nut length (engaged)'),
    material: z
      .string()
      .max(60)
      .optional()
      .describe('nut material: a library id, e.g. "bronze", or a name of the design\'s own (then give the allowables the checks need)'),
    allowablePressure: quantity('stress', 'allowable mean bearing pressure, used at any rubbing speed (overrides the material)').optional(),
    allowablePressureBySpeed: z
      .array(
        z.strictObject({
          upToRubbingSpeed: quantity('linearSpeed', 'highest rubbing speed at the mean diameter this allowable covers (omit on the last: any higher speed)').optional(),
          allowablePressure: quantity('stress', 'allowable mean bearing pressure up to that rubbing speed'),
        }),
      )
      .min(1)
      .max(12)
      .optional()
      .describe('allowable pressure against rubbing speed, slowest first (overrides the material)'),
    allowablePv: quantity('pv', 'allowable pV at the mean diameter, e.g. "2.5 MPa*m/s" (overrides the material)').optional(),
    yieldStrength: quantity('stress', 'nut material yield strength (overrides the material)').optional(),
    outsideDiameter: length('outside diameter of the nut body (for the nut body and heat checks)').optional(),
    flange: z
      .strictObject({ outsideDiameter: length('flange outside diameter'), thickness: length('flange thickness') })
      .optional()
      .describe('flange of a flanged nut (the load passes through it)'),
    safetyNut: z
      .strictObject({
        length: length('engaged length of the safety (follower) nut'),
        gap: length('axial gap before the safety nut takes the load (the wear allowed on the main nut)'),
      })
      .optional()
      .describe('safety (follower) nut, same thread and material as the nut'),
    tensileStrength: quantity('stress', 'nut material tensile strength (fatigue; overrides the material)').optional(),
    fatigueStrength: quantity('stress', 'nut material fatigue strength at the design cycles duty.cycles (bronzes have no endurance limit)').optional(),
    maxTemperature: quantity('temperature', 'highest service temperature of the nut material (overrides the material)').optional(),
    wearCoefficient: z
      .strictObject({
        value: quantity('specificWearRate', 'specific wear rate k of the thread pair (Archard)'),
        source: z.string().min(1, 'name the test report, supplier document or handbook').max(500),
      })
      .optional()
      .describe('specific wear rate of the screw/nut pair with its source, for the wear life'),
    allowableWear: length('axial wear (play) allowed on the nut before it is replaced (default: the safety nut gap)').optional(),
  }),
  screw: z.strictObject({
    material: z.string().max(60).optional().describe('screw material id from the library; supplies the three values below'),
    yieldStrength: quantity('stress', 'minimum yield strength').optional(),
    elasticModulus: quantity('stress', 'elastic modulus').optional(),
    density: quantity('density', 'mass density').optional(),
    unsupportedLength: length('unsupported length between supports (column and shaft length)'),
    ends: z.enum(END_CONDITIONS).describe('screw end conditions, for the column and whirl checks'),
    endConditionBasis: z.enum(['recommended', 'theoretical']).optional().describe('end-condition constants used: the recommended design values (default) or the theoretical ones'),
    whirlSpan: length('rotating span between the bearings, for whirl (default: screw.unsupportedLength)').optional(),
    whirlEnds: z.enum(END_CONDITIONS).optional().describe('end conditions of the rotating span, for whirl (default: screw.ends)'),
    tensileStrength: quantity('stress', 'minimum tensile strength, for fatigue (overrides the material)').optional(),
  }),
  duty: z.strictObject({
    kind: z.enum(['lifting', 'positioning', 'clamping']).describe('duty'),
    speed: quantity('rotationalSpeed', 'screw rotational speed').optional(),
    linearSpeed: quantity('linearSpeed', 'nut travel speed').optional(),
    brake: z.boolean().describe('brake fitted'),
    vibration: z.boolean().optional().describe('vibration or shock at the screw (self-locking is then not relied on)'),
    brakeTorque: quantity('torque', 'rated static torque of the brake, at the shaft it sits on (needs duty.brake true)').optional(),
    brakeLocation: z.enum(['screw', 'motor']).optional().describe('shaft the brake sits on: "screw" (default) or "motor" (ahead of drive.gearbox)'),
    stroke: length('travel of the nut per stroke').optional(),
    cyclesPerHour: z.number().finite().positive('must be greater than zero').max(1e5).optional().describe('full cycles (raise and lower one stroke) per hour'),
    dutyCycle: z.number().finite().positive('must be within 0..1 (above 0)').max(1, 'must be within 0..1').optional().describe('fraction of the time the screw runs, 0..1'),
    ambientTemperature: quantity('temperature', 'ambient temperature around the nut (default 40 degC)').optional(),
    cycles: z.number().finite().positive('must be greater than zero').max(1e12).optional().describe('load cycles over the design life, for fatigue'),
    hoistingClass: z.enum(HOISTING_CLASSES).optional().describe('hoisting class of EN 13001-2 for the dynamic factor on lifting duty (default HC2)'),
    dynamicFactor: z.number().finite().min(1, 'a dynamic factor is at least 1').max(10).optional().describe('dynamic factor on the lifted load (overrides the hoisting class)'),
    brakeResponseTime: quantity('time', 'time from the stop command until the brake holds').optional(),
    designLife: quantity('serviceTime', 'running time (screw turning) the nut thread and a rolling thrust bearing must last, e.g. "5000 h"; the wear life and the bearing L10 life are held against it').optional(),
  }),
  drive: z
    .strictObject({
      availableTorque: quantity('torque', 'torque the drive can deliver at start (at the motor shaft when drive.gearbox is given)'),
      loadMass: quantity('mass', 'mass moved with the nut (default on lifting duty: load.axial / g)').optional(),
      accelerationTime: quantity('time', 'time to reach the operating speed (needs duty.speed or duty.linearSpeed)').optional(),
      acceleration: quantity('linearAcceleration', 'linear acceleration of the nut').optional(),
      gearbox: z
        .strictObject({
          ratio: z.number().finite().positive('ratio must be greater than zero').max(10000).describe('motor speed over screw speed'),
          efficiency: z.number().finite().positive('efficiency must be within 0..1 (above 0)').max(1, 'efficiency must be within 0..1').describe('forward efficiency, motor driving'),
          reverseEfficiency: z.number().finite().positive('efficiency must be within 0..1 (above 0)').max(1, 'efficiency must be within 0..1').describe('reverse efficiency, load driving the gearbox backwards'),
        })
        .optional(),
      motorInertia: quantity('inertia', "mass moment of inertia of the motor's rotor and brake disc, for the stopping distance").optional(),
    })
    .optional(),
});

export type DesignInput = z.input<typeof designInputSchema>;

/** One validation problem, with the dotted path of the field at fault. */
export interface FieldIssue {
  readonly path: string;
  readonly message: string;
}

export type DesignParseResult =
  | { readonly success: true; readonly design: Design }
  | { readonly success: false; readonly issues: readonly FieldIssue[] };

function pathOf(path: readonly PropertyKey[]): string {
  return path.map(String).join('.');
}

interface RawIssue {
  readonly code?: string;
  readonly path: readonly PropertyKey[];
  readonly message: string;
  readonly errors?: readonly (readonly RawIssue[])[];
}

/**
 * Field issues from zod's, with a failed choice (a union such as a friction range typed in or a library entry)
 * replaced by the issues of the branch the input meant: the one whose failures are fewest, counting a wrong or
 * unknown key at the branch's own level as a mismatch of shape. So `"min": "NaN"` is reported at friction.collar.min.
 */
function fieldIssues(issues: readonly RawIssue[], prefix: readonly PropertyKey[] = []): FieldIssue[] {
  const out: FieldIssue[] = [];
  for (const issue of issues) {
    const path = [...prefix, ...issue.path];
    if (issue.code === 'invalid_union' && issue.errors && issue.errors.length > 0) {
      const score = (branch: readonly RawIssue[]) =>
        branch.reduce((n, i) => n + (i.path.length === 0 || i.code === 'unrecognized_keys' ? 100 : 1), 0);
      const best = [...issue.errors].sort((a, b) => score(a) - score(b))[0];
      if (best.length > 0 && score(best) < 100) {
        out.push(...fieldIssues(best, path));
        continue;
      }
      // No branch is clearly meant: say what each accepted form found wrong
      const forms = issue.errors.map((branch) => branch.map((i) => `${i.path.length > 0 ? `${pathOf(i.path)}: ` : ''}${i.message}`).join(', '));
      out.push({ path: pathOf(path) || '(body)', message: `matches none of the accepted forms: ${forms.join('; or ')}` });
      continue;
    }
    out.push({ path: pathOf(path) || '(body)', message: issue.message });
  }
  return out;
}

/** Validates a raw design input and converts it to engine units; never throws on bad input. */
export function parseDesign(raw: unknown): DesignParseResult {
  const shape = designInputSchema.safeParse(raw);
  if (!shape.success) {
    return { success: false, issues: fieldIssues(shape.error.issues as readonly RawIssue[]) };
  }
  return normalizeDesign(shape.data);
}

type Parsed = z.output<typeof designInputSchema>;

/**
 * Plausible magnitudes per dimension, in engine units (SI; rotational speed in rpm): a quantity outside its range is
 * refused with 422 naming the field, because a finite but absurd value (a length of 1e229 mm) makes the engine's
 * figures overflow to Infinity or NaN. Sanity bounds, common practice: generous, orders of magnitude beyond any
 * power screw, so no real design is refused; the reason for each bound is beside it.
 */
export const PLAUSIBLE_RANGE: Readonly<Record<Dimension, { readonly min: number; readonly max: number; readonly text: string; readonly reason: string }>> = {
  length: { min: 1e-6, max: 1e3, text: '1 um to 1 km', reason: 'no thread feature is below a micrometre; no screw, span or nut is longer than a kilometre' },
  force: { min: 1e-3, max: 1e9, text: '1 mN to 1 GN', reason: 'the largest presses are of the order of 1e8 N' },
  stress: { min: 1, max: 1e13, text: '1 Pa to 10 TPa', reason: 'the stiffest solids (diamond, about 1.2 TPa modulus) are below a tenth of the bound' },
  torque: { min: 1e-6, max: 1e9, text: '1 uN*m to 1 GN*m', reason: 'a bound of the same order as the force bound times a metre' },
  density: { min: 1, max: 1e5, text: '1 to 100,000 kg/m^3', reason: 'the densest element (osmium, about 22,600 kg/m^3) is below a quarter of the bound' },
  rotationalSpeed: { min: 1e-6, max: 1e6, text: '1e-6 rpm to 1e6 rpm', reason: 'the fastest spindles run at about 1e5 rpm' },
  linearSpeed: { min: 1e-9, max: 1e3, text: '1 nm/s to 1 km/s', reason: 'a screw-driven load moves far below the speed of sound' },
  angle: { min: 1e-9, max: 2 * Math.PI, text: 'up to one turn', reason: 'an angle of a thread flank is below a right angle' },
  pv: { min: 1e-3, max: 1e10, text: '1 mPa*m/s to 10 GPa*m/s', reason: 'bearing pV limits are of the order of 1e6 to 1e7 Pa*m/s' },
  mass: { min: 1e-6, max: 1e9, text: '1 mg to 1,000,000 t', reason: 'the force bound divided by standard gravity, rounded up' },
  time: { min: 1e-6, max: 1e6, text: '1 us to 1e6 s', reason: 'an acceleration takes between microseconds and days' },
  serviceTime: { min: 1, max: 1e10, text: '1 s to 1e10 s', reason: 'about 300 years, beyond any machine' },
  linearAcceleration: { min: 1e-6, max: 1e5, text: '1 um/s^2 to 1e5 m/s^2', reason: 'about 10,000 g, beyond any screw drive' },
  temperature: { min: 1, max: 2000, text: '1 K to 2000 K', reason: 'absolute zero below, steel melts below 2000 K' },
  inertia: { min: 1e-12, max: 1e6, text: '1e-12 to 1e6 kg*m^2', reason: 'from the smallest servo rotor to far beyond any screw drive' },
  specificWearRate: { min: 1e-24, max: 1e-6, text: '1e-24 to 1e-6 m^2/N', reason: 'measured specific wear rates lie between about 1e-18 and 1e-12 m^2/N' },
};

/** Converts a shape-valid input into engine units and checks the rules that span fields. */
function normalizeDesign(input: Parsed): DesignParseResult {
  const issues: FieldIssue[] = [];
  let us = 0;
  let si = 0;
  /** Converts one quantity; a bad one is reported at its path and yields NaN (the design is refused anyway). */
  const q = (text: string, dimension: Dimension, path: string): number => {
    const r = parseQuantity(text, dimension);
    if (r instanceof QuantityError) {
      issues.push({ path, message: r.message });
      return NaN;
    }
    if (!(r.si > 0)) {
      issues.push({ path, message: `must be greater than zero, got "${text}"` });
      return NaN;
    }
    const range = PLAUSIBLE_RANGE[dimension];
    if (r.si < range.min || r.si > range.max) {
      issues.push({ path, message: `"${text}" is outside the plausible range ${range.text} (${range.reason})` });
      return NaN;
    }
    if (r.usCustomary) us++;
    else if (dimension !== 'rotationalSpeed' && dimension !== 'angle' && dimension !== 'time' && dimension !== 'serviceTime') si++;
    return r.si;
  };
  const opt = (text: string | undefined, dimension: Dimension, path: string): number | null =>
    text === undefined ? null : q(text, dimension, path);

  // Thread: a named size, or major diameter and pitch
  const th = input.thread;
  let majorDiameter = opt(th.majorDiameter, 'length', 'thread.majorDiameter');
  let pitch = opt(th.pitch, 'length', 'thread.pitch');
  let size: string | null = null;
  if (th.size !== undefined) {
    const found = findThreadSize(th.size);
    if (!found) issues.push({ path: 'thread.size', message: `unknown standard size "${th.size}" (see GET /api/v1/thread-sizes)` });
    else if (found.form !== th.form) issues.push({ path: 'thread.size', message: `"${th.size}" is a ${found.form} size, but thread.form is ${th.form}` });
    else {
      const agrees = (given: number | null, table: number) => given === null || Math.abs(given - table) <= 1e-9 + 1e-6 * table;
      if (!agrees(majorDiameter, found.majorDiameter)) issues.push({ path: 'thread.majorDiameter', message: `disagrees with size ${found.designation}; omit it or make it match` });
      if (!agrees(pitch, found.pitch)) issues.push({ path: 'thread.pitch', message: `disagrees with size ${found.designation}; omit it or make it match` });
      majorDiameter = found.majorDiameter;
      pitch = found.pitch;
      size = found.designation;
      if (/ACME|UNC/.test(found.designation)) us++;
      else si++;
    }
  } else {
    if (majorDiameter === null) issues.push({ path: 'thread.majorDiameter', message: 'required unless thread.size is given' });
    if (pitch === null) issues.push({ path: 'thread.pitch', message: 'required unless thread.size is given' });
  }
  if (majorDiameter !== null && pitch !== null && pitch >= majorDiameter) { // NaN compares false: already reported
    issues.push({ path: 'thread.pitch', message: 'pitch must be smaller than the major diameter' });
  }
  let loadFlankAngle: number | null = null;
  if (th.form === 'buttress') {
    if (th.loadFlankAngle === undefined) issues.push({ path: 'thread.loadFlankAngle', message: 'required for a buttress thread: 3 or 7 deg' });
    else {
      const deg = typeof th.loadFlankAngle === 'number' ? th.loadFlankAngle : (q(th.loadFlankAngle, 'angle', 'thread.loadFlankAngle') * 180) / Math.PI;
      const known = Object.keys(BUTTRESS_PROFILES).map(Number).find((a) => Math.abs(a - deg) < 1e-6);
      if (known === undefined) issues.push({ path: 'thread.loadFlankAngle', message: 'buttress geometry is tabulated for 3 deg (3/30) and 7 deg (7/45) load flanks' });
      else loadFlankAngle = known;
    }
  } else if (th.loadFlankAngle !== undefined) {
    issues.push({ path: 'thread.loadFlankAngle', message: 'only a buttress thread takes a load-flank angle' });
  }

  // Tolerance class: the checks use its minimum-material diameters
  let toleranceClass: string | null = null;
  if (th.toleranceClass !== undefined) {
    const held = TOLERANCE_CLASSES[th.form] ?? [];
    if (!held.includes(th.toleranceClass)) {
      issues.push({
        path: 'thread.toleranceClass',
        message: held.length > 0 ? `${th.form} threads take one of ${held.map((c) => `"${c}"`).join(', ')}` : `no tolerance class is held for ${th.form} threads; omit it (the basic profile is used)`,
      });
    } else if (th.form === 'trapezoidal' && majorDiameter !== null && pitch !== null && !iso2903Row(majorDiameter, pitch)) {
      issues.push({ path: 'thread.toleranceClass', message: 'ISO 2903 7H/7e limits are held for the standard sizes Tr 8x1.5 to Tr 120x22 only' });
    } else toleranceClass = th.toleranceClass;
  }

  // Friction ranges, typed in or from the library
  const friction = (value: Parsed['friction']['thread'], path: string, surface: 'thread' | 'collar'): FrictionRange | null => {
    if ('entry' in value) {
      const e = findFrictionEntry(value.entry);
      if (!e) {
        issues.push({ path: `${path}.entry`, message: `unknown friction-library entry "${value.entry}" (see GET /api/v1/friction-sources)` });
        return null;
      }
      if (e.surface !== surface) {
        issues.push({ path: `${path}.entry`, message: `"${value.entry}" is a ${e.surface} entry, not a ${surface} entry` });
        return null;
      }
      return { min: e.min, max: e.max, source: e.source, entry: e.id };
    }
    if (value.min > value.max) issues.push({ path: `${path}.min`, message: 'min must not exceed max' });
    return { min: value.min, max: value.max, source: value.source };
  };
  const threadFriction = friction(input.friction.thread, 'friction.thread', 'thread');
  let collarFriction: FrictionRange | null = null;
  if (input.collar.kind !== 'none') {
    if (input.friction.collar === undefined) issues.push({ path: 'friction.collar', message: `required for a ${input.collar.kind} collar` });
    else collarFriction = friction(input.friction.collar, 'friction.collar', 'collar');
  }

  // Collar
  const c = input.collar;
  let collar: Design['collar'];
  switch (c.kind) {
    case 'plain':
      collar = { kind: 'plain', meanDiameter: q(c.meanDiameter, 'length', 'collar.meanDiameter'), allowablePressure: opt(c.allowablePressure, 'stress', 'collar.allowablePressure') };
      break;
    case 'rolling':
      collar = {
        kind: 'rolling',
        meanDiameter: q(c.meanDiameter, 'length', 'collar.meanDiameter'),
        dynamicRating: opt(c.dynamicRating, 'force', 'collar.dynamicRating'),
        staticRating: opt(c.staticRating, 'force', 'collar.staticRating'),
        rollingElement: c.rollingElement ?? null,
        ratingSource: c.ratingSource ?? null,
      };
      if ((c.dynamicRating !== undefined || c.staticRating !== undefined) && c.ratingSource === undefined) {
        issues.push({ path: 'collar.ratingSource', message: "name where the bearing's ratings come from (catalogue, designation)" });
      }
      break;
    case 'annular': {
      const outer = q(c.outerDiameter, 'length', 'collar.outerDiameter');
      const inner = q(c.innerDiameter, 'length', 'collar.innerDiameter');
      if (inner >= outer) issues.push({ path: 'collar.innerDiameter', message: 'inner diameter must be smaller than the outer diameter' });
      collar = { kind: 'annular', outerDiameter: outer, innerDiameter: inner, model: c.model, allowablePressure: opt(c.allowablePressure, 'stress', 'collar.allowablePressure') };
      break;
    }
    case 'none':
      collar = { kind: 'none' };
  }

  // Nut: a library material supplies what the design does not give; any other name is the design's own material,
  // accepted when the design gives the values the wear checks need (allowable pressure; pV too when a speed is given)
  const n = input.nut;
  const nutMaterial = n.material === undefined ? null : findNutMaterial(n.material);
  // A material of the design's own without the allowables is evaluated: each check it cannot compute is listed in the
  // evaluation's notComputed (and judged by the rules), never a refusal of the whole design
  if (n.allowablePressure !== undefined && n.allowablePressureBySpeed !== undefined) {
    issues.push({ path: 'nut.allowablePressureBySpeed', message: 'give either nut.allowablePressure (any speed) or nut.allowablePressureBySpeed, not both' });
  }
  let ownSteps: PressureSpeedPoint[] | null = null;
  if (n.allowablePressureBySpeed !== undefined) {
    ownSteps = n.allowablePressureBySpeed.map((step, i) => {
      const at = `nut.allowablePressureBySpeed.${i}`;
      const upTo = opt(step.upToRubbingSpeed, 'linearSpeed', `${at}.upToRubbingSpeed`);
      if (upTo === null && i < n.allowablePressureBySpeed!.length - 1) {
        issues.push({ path: `${at}.upToRubbingSpeed`, message: 'only the last step may omit its speed (it then covers any higher speed)' });
      }
      return { upToRubbingSpeed: upTo, allowablePressure: q(step.allowablePressure, 'stress', `${at}.allowablePressure`), application: upTo === null ? 'design value, any higher speed' : 'design value', source: `design input (${at})` };
    });
    ownSteps.forEach((step, i) => {
      const before = ownSteps![i - 1];
      if (!before) return;
      const at = `nut.allowablePressureBySpeed.${i}`;
      if (before.upToRubbingSpeed !== null && step.upToRubbingSpeed !== null && !(step.upToRubbingSpeed > before.upToRubbingSpeed)) {
        issues.push({ path: `${at}.upToRubbingSpeed`, message: 'steps must run from low to high speed' });
      }
      if ((step.allowablePressure ?? 0) > (before.allowablePressure ?? 0)) {
        issues.push({ path: `${at}.allowablePressure`, message: 'must not exceed the allowable at a lower speed (the allowable never rises with speed)' });
      }
    });
    ownSteps = ownSteps.map((step) => ({ ...step, application: `the design's own value up to ${step.upToRubbingSpeed === null ? 'any speed' : `${Number((step.upToRubbingSpeed * 60).toPrecision(4))} m/min`}` }));
  }
  const ownPressure = opt(n.allowablePressure, 'stress', 'nut.allowablePressure');
  const nut: Design['nut'] = {
    length: q(n.length, 'length', 'nut.length'),
    material: n.material ?? null,
    materialSource: n.material === undefined ? null : nutMaterial ? 'library' : 'design',
    allowablePressure: ownPressure,
    pressureBySpeed: ownPressure !== null ? null : (ownSteps ?? (nutMaterial && nutMaterial.pressureBySpeed.length > 0 ? nutMaterial.pressureBySpeed : null)),
    allowablePv: opt(n.allowablePv, 'pv', 'nut.allowablePv') ?? nutMaterial?.allowablePv ?? null,
    yieldStrength: opt(n.yieldStrength, 'stress', 'nut.yieldStrength') ?? nutMaterial?.yieldStrength ?? null,
    outsideDiameter: opt(n.outsideDiameter, 'length', 'nut.outsideDiameter'),
    flange: n.flange ? { outsideDiameter: q(n.flange.outsideDiameter, 'length', 'nut.flange.outsideDiameter'), thickness: q(n.flange.thickness, 'length', 'nut.flange.thickness') } : null,
    safetyNut: n.safetyNut ? { length: q(n.safetyNut.length, 'length', 'nut.safetyNut.length'), gap: q(n.safetyNut.gap, 'length', 'nut.safetyNut.gap') } : null,
    tensileStrength: opt(n.tensileStrength, 'stress', 'nut.tensileStrength') ?? nutMaterial?.tensileStrength ?? null,
    fatigueStrength: opt(n.fatigueStrength, 'stress', 'nut.fatigueStrength'),
    maxTemperature: opt(n.maxTemperature, 'temperature', 'nut.maxTemperature') ?? nutMaterial?.maxTemperature ?? null,
    maxTemperatureSource: n.maxTemperature !== undefined ? 'design input (nut.maxTemperature)' : nutMaterial?.maxTemperature != null ? nutMaterial.maxTemperatureSource : null,
    wearCoefficient: n.wearCoefficient ? { value: q(n.wearCoefficient.value, 'specificWearRate', 'nut.wearCoefficient.value'), source: n.wearCoefficient.source } : null,
    allowableWear: opt(n.allowableWear, 'length', 'nut.allowableWear'),
  };
  if (nut.flange && nut.outsideDiameter == null) issues.push({ path: 'nut.outsideDiameter', message: 'a flange needs the nut body\'s outside diameter' });
  if (nut.flange && nut.outsideDiameter != null && !(nut.flange.outsideDiameter > nut.outsideDiameter)) {
    issues.push({ path: 'nut.flange.outsideDiameter', message: "must be larger than the nut's outside diameter" });
  }
  if (pitch !== null && nut.length < pitch) issues.push({ path: 'nut.length', message: 'the nut must engage at least one full pitch' });
  if (pitch !== null && nut.safetyNut && nut.safetyNut.length < pitch) issues.push({ path: 'nut.safetyNut.length', message: 'the safety nut must engage at least one full pitch' });
  if (majorDiameter !== null && nut.outsideDiameter != null && !(nut.outsideDiameter > majorDiameter)) {
    issues.push({ path: 'nut.outsideDiameter', message: "must be larger than the thread's major diameter" });
  }

  // Screw, with its library material
  const s = input.screw;
  const screwMaterial = s.material === undefined ? null : findScrewMaterial(s.material);
  if (screwMaterial === undefined) issues.push({ path: 'screw.material', message: `unknown screw material "${s.material}" (see GET /api/v1/materials)` });
  const screwValue = (key: 'yieldStrength' | 'elasticModulus' | 'density', dimension: Dimension): number => {
    const given = opt(s[key], dimension, `screw.${key}`);
    if (given !== null) return given;
    if (screwMaterial) return screwMaterial[key];
    if (screwMaterial !== undefined) issues.push({ path: `screw.${key}`, message: 'required unless screw.material names a library material' });
    return NaN;
  };
  const screw: Design['screw'] = {
    material: s.material ?? null,
    yieldStrength: screwValue('yieldStrength', 'stress'),
    elasticModulus: screwValue('elasticModulus', 'stress'),
    density: screwValue('density', 'density'),
    unsupportedLength: q(s.unsupportedLength, 'length', 'screw.unsupportedLength'),
    ends: s.ends,
    endConditionBasis: s.endConditionBasis ?? 'recommended',
    whirlSpan: opt(s.whirlSpan, 'length', 'screw.whirlSpan'),
    whirlEnds: s.whirlEnds ?? null,
    tensileStrength: opt(s.tensileStrength, 'stress', 'screw.tensileStrength') ?? screwMaterial?.tensileStrength ?? null,
  };

  // Duty
  const d = input.duty;
  if (d.speed !== undefined && d.linearSpeed !== undefined) {
    issues.push({ path: 'duty.linearSpeed', message: 'give either duty.speed or duty.linearSpeed, not both' });
  }
  const duty: Design['duty'] = {
    kind: d.kind,
    speed: opt(d.speed, 'rotationalSpeed', 'duty.speed'),
    linearSpeed: opt(d.linearSpeed, 'linearSpeed', 'duty.linearSpeed'),
    brake: d.brake,
    vibration: d.vibration ?? false,
    brakeTorque: opt(d.brakeTorque, 'torque', 'duty.brakeTorque'),
    brakeLocation: d.brakeLocation ?? 'screw',
    stroke: opt(d.stroke, 'length', 'duty.stroke'),
    cyclesPerHour: d.cyclesPerHour ?? null,
    dutyCycle: d.dutyCycle ?? null,
    ambientTemperature: opt(d.ambientTemperature, 'temperature', 'duty.ambientTemperature'),
    cycles: d.cycles ?? null,
    hoistingClass: d.hoistingClass ?? null,
    dynamicFactor: d.dynamicFactor ?? null,
    brakeResponseTime: opt(d.brakeResponseTime, 'time', 'duty.brakeResponseTime'),
    designLife: opt(d.designLife, 'serviceTime', 'duty.designLife'),
  };
  if (d.brakeResponseTime !== undefined && !d.brake) issues.push({ path: 'duty.brakeResponseTime', message: 'a brake response time needs duty.brake true' });

  const axial = q(input.load.axial, 'force', 'load.axial');
  if (d.brakeTorque !== undefined && !d.brake) issues.push({ path: 'duty.brakeTorque', message: 'a brake torque needs duty.brake true' });
  if (d.brakeLocation === 'motor' && !d.brake) issues.push({ path: 'duty.brakeLocation', message: 'a brake location needs duty.brake true' });
  const dr = input.drive;
  if (dr?.accelerationTime !== undefined && dr.acceleration !== undefined) {
    issues.push({ path: 'drive.acceleration', message: 'give either drive.accelerationTime or drive.acceleration, not both' });
  }
  if (dr?.accelerationTime !== undefined && d.speed === undefined && d.linearSpeed === undefined) {
    issues.push({ path: 'drive.accelerationTime', message: 'a time to speed needs the operating speed: give duty.speed or duty.linearSpeed' });
  }
  const drive: Design['drive'] = dr
    ? {
        availableTorque: q(dr.availableTorque, 'torque', 'drive.availableTorque'),
        loadMass: opt(dr.loadMass, 'mass', 'drive.loadMass'),
        accelerationTime: opt(dr.accelerationTime, 'time', 'drive.accelerationTime'),
        acceleration: opt(dr.acceleration, 'linearAcceleration', 'drive.acceleration'),
        gearbox: dr.gearbox ?? null,
        motorInertia: opt(dr.motorInertia, 'inertia', 'drive.motorInertia'),
      }
    : null;
  // The nut body's wall lies outside the nut thread's root (D_4, above the major diameter where the form has a clearance)
  if (issues.length === 0 && majorDiameter !== null && pitch !== null && nut.outsideDiameter != null && (th.form !== 'buttress' || loadFlankAngle !== null)) {
    const root = threadGeometry({ form: th.form, majorDiameter, pitch, starts: th.starts ?? 1, loadFlankAngle }).nutMajorDiameter;
    if (!(nut.outsideDiameter > root)) {
      issues.push({ path: 'nut.outsideDiameter', message: `must be larger than the nut thread's root diameter (${Number((root * 1000).toPrecision(6))} mm)` });
    }
  }
  if (issues.length > 0 || majorDiameter === null || pitch === null || threadFriction === null) {
    return { success: false, issues };
  }
  return {
    success: true,
    design: {
      thread: { form: th.form, size, majorDiameter, pitch, starts: th.starts ?? 1, loadFlankAngle, toleranceClass },
      load: { axial, sense: input.load.sense },
      friction: { thread: threadFriction, collar: collarFriction },
      collar,
      nut,
      screw,
      duty,
      drive,
      unitSystem: us > si ? 'US' : 'SI',
    },
  };
}

/**
 * A design input field's name in words, from the contract's own description of it (the text before its first
 * comma, colon or bracket: "nut.length" -> "Nut length"), else its path in words ("friction › thread › min").
 * An array index numbers the element from 1 ("nut.allowablePressureBySpeed.0.allowablePressure" -> "... (step 1)").
 */
export function designFieldLabel(path: string, input?: unknown): string {
  let node: z.ZodType | undefined = designInputSchema;
  let description: string | undefined;
  const parts = path.replace(/^design\./, '').split('.');
  // with the input at hand, a field inside a choice (the collar's kind) is read from the option the input chose
  let value: unknown = input;
  for (const part of parts) {
    node = node && childOf(node, part, value);
    value = value !== null && typeof value === 'object' ? (value as Record<string, unknown>)[part] : undefined;
    if (!node) break;
    description = node.description ?? unwrapped(node).description;
  }
  const words = node && description ? description.split(/[,:(]/)[0].trim() : '';
  // a friction range reads the same on both surfaces: name the surface
  const surface = parts[0] === 'friction' && parts[1] ? parts[1] + ' friction — ' : '';
  const text = surface + words;
  // an element of a list (a pressure step) is numbered from 1, as a sheet numbers its rows
  const index = parts.find((p) => /^\d+$/.test(p));
  const step = index === undefined ? '' : ` (step ${Number(index) + 1})`;
  if (words) return text.charAt(0).toUpperCase() + text.slice(1) + step;
  return parts.filter((p) => !/^\d+$/.test(p)).join(' › ') + step;
}

/**
 * The dimension of a field of the design input ("duty.designLife" -> "serviceTime"), as its schema declares it; null
 * for a field that is not a quantity (a count, a coefficient, a ratio, a word) or not a field. The normalized design
 * holds each quantity in the engine's unit of its dimension (libs/mechanics units.ts; angles in degrees, speeds in
 * rev/min), so this is also the unit of a normalized value.
 */
export function designFieldDimension(path: string): Dimension | null {
  let node: z.ZodType | undefined = designInputSchema;
  for (const part of path.replace(/^design\./, '').split('.')) {
    node = node && childOf(node, part);
    if (!node) return null;
  }
  return dimensionOf(node);
}

/** One field of a design input as entered: its dotted path, its label (designFieldLabel) and the value as typed. */
export interface DesignInputField {
  readonly path: string;
  readonly label: string;
  readonly value: string;
}

/**
 * Every field of a design input as it was entered (the verbatim input of a revision), in its own order, each with
 * its label: what a reviewer may comment on (a comment's target `field` names one of these paths).
 */
export function designInputFields(input: unknown): DesignInputField[] {
  const out: DesignInputField[] = [];
  const walk = (value: unknown, path: string): void => {
    if (value !== null && typeof value === 'object') {
      const entries = Array.isArray(value) ? value.map((v, i) => [String(i), v] as const) : Object.entries(value as Record<string, unknown>);
      for (const [k, v] of entries) walk(v, path ? `${path}.${k}` : k);
      return;
    }
    if (path) out.push({ path, label: designFieldLabel(path, input), value: value === null || value === undefined ? '—' : String(value) });
  };
  walk(input, '');
  return out;
}

function dimensionOf(node: z.ZodType): Dimension | null {
  const n = unwrapped(node);
  const own = FIELD_DIMENSION.get(n);
  if (own !== undefined) return own;
  if (n instanceof z.ZodUnion) {
    for (const option of n.options as z.ZodType[]) {
      const found = dimensionOf(option);
      if (found !== null) return found;
    }
  }
  return null;
}

/** The option of a discriminated union whose discriminator literal the value carries. */
function chosenOption(u: z.ZodDiscriminatedUnion, value: Record<string, unknown>): z.ZodType | undefined {
  const discriminator = (u.def as { discriminator: string }).discriminator;
  return (u.options as z.ZodType[]).find((option) => {
    const literal = unwrapped(option) instanceof z.ZodObject ? ((unwrapped(option) as z.ZodObject).shape as Record<string, z.ZodType>)[discriminator] : undefined;
    return literal instanceof z.ZodLiteral && (literal.values as Set<unknown>).has(value[discriminator]);
  });
}

function unwrapped(node: z.ZodType): z.ZodType {
  let n = node as z.ZodType & { unwrap?: () => z.ZodType };
  while (n instanceof z.ZodOptional || n instanceof z.ZodNullable || n instanceof z.ZodDefault) n = (n as z.ZodOptional<z.ZodType>).unwrap();
  return n;
}

function childOf(node: z.ZodType, key: string, value?: unknown): z.ZodType | undefined {
  const n = unwrapped(node);
  if (n instanceof z.ZodArray) return /^\d+$/.test(key) ? (n.element as z.ZodType) : undefined;
  if (n instanceof z.ZodObject) return (n.shape as Record<string, z.ZodType>)[key];
  if (n instanceof z.ZodUnion || n instanceof z.ZodDiscriminatedUnion) {
    // the option whose discriminator the value carries, when there is a value to tell (else the first that has the key)
    const chosen = n instanceof z.ZodDiscriminatedUnion && value !== null && typeof value === 'object' ? chosenOption(n, value as Record<string, unknown>) : undefined;
    if (chosen) return childOf(chosen, key);
    for (const option of n.options as z.ZodType[]) {
      const found = childOf(option, key);
      if (found) return found;
    }
  }
  return undefined;
}
