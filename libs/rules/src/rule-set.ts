/**
 * A rule set: a version name and every number the design rules judge against. The rules hold no
 * numbers of their own, so a new rule set (posted by an admin, validated with `ruleSetDefinitionSchema`)
 * changes limits without a code change, and an impact report can rerun old revisions under it.
 */
import { z } from 'zod';

/** A positive, finite number. */
const positive = (description: string) => z.number().finite().positive().describe(description);
/** A factor that only makes sense at or above 1 (a margin or a factor of safety). */
const atLeastOne = (description: string) => z.number().finite().min(1, 'must be at least 1').describe(description);
/** A fraction of a limit, 0 < x <= 1. */
const fraction = (description: string) =>
  z.number().finite().positive().max(1, 'must not exceed 1 (a fraction of the limit)').describe(description);

/** A minimum factor for each duty kind: lifting stricter than positioning and clamping. */
const byDuty = (what: string) =>
  z.strictObject({
    lifting: atLeastOne(`minimum ${what} on lifting duty`),
    positioning: atLeastOne(`minimum ${what} on positioning duty`),
    clamping: atLeastOne(`minimum ${what} on clamping duty`),
  });

export const thresholdsSchema = z
  .strictObject({
    selfLocking: z.strictObject({
      minMargin: atLeastOne('self-locking margin f_min / (cos alpha_n tan lambda) below which self-locking is not relied on'),
    }),
    strength: z.strictObject({
      minSafetyFactor: byDuty('static yield factor of safety (body, first-thread root, thread stripping)'),
    }),
    buckling: z.strictObject({
      minSafetyFactor: byDuty('column buckling factor P_cr / F'),
    }),
    criticalSpeed: z.strictObject({
      maxRatio: fraction('largest operating speed as a fraction of the first critical (whirl) speed; above it blocks'),
      warnRatio: fraction('fraction of the first critical speed above which a warning is raised'),
    }),
    wear: z.strictObject({
      maxPressureRatio: positive('largest mean bearing pressure as a fraction of the allowable; above it blocks'),
      warnPressureRatio: positive('bearing-pressure fraction of the allowable above which a warning is raised'),
      maxPvRatio: positive('largest pV as a fraction of the allowable pV; above it blocks'),
      warnPvRatio: positive('pV fraction of the allowable above which a warning is raised'),
    }),
    drive: z.strictObject({
      minMargin: atLeastOne('available over required raise torque (maximum friction) below which the drive blocks'),
      warnMargin: atLeastOne('torque margin below which a warning is raised'),
    }),
    friction: z.strictObject({
      minThreadSpreadRatio: atLeastOne('thread friction max/min below which the range is treated as a single value'),
    }),
    engagedThreads: z.strictObject({
      min: positive('fewest engaged threads before a warning'),
      max: positive('most engaged threads before a warning'),
    }),
    // Added in 2026.12-2. Optional so that earlier definitions (2026.12-1) still parse unchanged and judge as before:
    // where a group is absent, the check it brought is not part of that version (see the accessors below).
    nutThreads: z
      .strictObject({
        minSafetyFactor: byDuty("static yield factor of safety of the nut's own threads (root bending, shear)"),
      })
      .optional()
      .describe("added in 2026.12-2; absent in earlier versions (the nut-thread-root-yield rule then does not run)"),
    missingValues: z
      .strictObject({
        onLifting: z
          .enum(['blocking', 'info'])
          .describe('severity on lifting duty of a strength check that cannot be computed because a value is missing'),
      })
      .optional()
      .describe('added in 2026.12-2; absent in earlier versions (a missing value is then information, as 2026.12-1 judged)'),
    brake: z
      .strictObject({
        minHoldingFactor: atLeastOne('rated brake torque over the zero-friction holding torque F l / (2 pi) at the brake shaft, below which the brake check fails'),
      })
      .optional()
      .describe('added in 2026.12-2; absent in earlier versions (the brake-holding-torque rule then does not run)'),
    // Added in 2026.12-3 for the engine 1.2 figures; optional so that 2026.12-1 and 2026.12-2 parse and judge as before.
    dynamicFactor: z
      .strictObject({
        onLifting: z.boolean().describe("whether the strength checks on lifting duty read the engine's dynamic factors (static factor / dynamic factor)"),
      })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (strength checks then read the static factors)'),
    nutBody: z
      .strictObject({ minSafetyFactor: byDuty('static yield factor of safety of the nut body and its flange') })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the nut-body rules then do not run)'),
    safetyNut: z
      .strictObject({
        minSafetyFactor: atLeastOne('static factor of safety of the safety nut against stripping when it carries the load'),
        minWornSafetyFactor: byDuty("stripping factor of safety of the main nut's threads worn by the wear allowed"),
      })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the safety-nut and worn-thread rules then do not run)'),
    nutTemperature: z
      .strictObject({ minTemperatureMargin: z.number().finite().min(0).describe('kelvin the estimated nut temperature must stay below the material limit') })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the nut-temperature rule then does not run)'),
    stopping: z
      .strictObject({ mustStop: z.boolean().describe('whether a brake that cannot stop a descending load blocks') })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the brake-stopping rule then does not run)'),
    fatigue: z
      .strictObject({ minSafetyFactor: atLeastOne('Goodman factor of safety of the screw root and nut threads under repeated lifting') })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the fatigue rules then do not run)'),
    collarBearing: z
      .strictObject({
        maxPressureRatio: positive('largest plain-collar bearing pressure as a fraction of its allowable'),
        minStaticSafetyFactor: atLeastOne('static safety C_0a / P_0a of a rolling thrust bearing'),
      })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the collar-bearing rules then do not run)'),
    notComputed: z
      .strictObject({
        onLifting: z.enum(['blocking', 'info']).describe('severity on lifting duty of a check the engine could not compute (always information otherwise)'),
      })
      .optional()
      .describe('added in 2026.12-3; absent in earlier versions (the engine-not-computed rule then does not run)'),
    // Added in 2026.12-4 with the design-life input (duty.designLife); optional so that earlier versions parse and judge as before.
    designLife: z
      .strictObject({
        minLifeRatio: positive('smallest wear life or bearing L10 life as a multiple of duty.designLife; below it warns (the part is replaced earlier)'),
      })
      .optional()
      .describe('added in 2026.12-4; absent in earlier versions (the design-life rules then do not run)'),
  })
  .superRefine((t, ctx) => {
    const issue = (path: PropertyKey[], message: string) => ctx.addIssue({ code: 'custom', path, message });
    if (t.criticalSpeed.warnRatio > t.criticalSpeed.maxRatio) issue(['criticalSpeed', 'warnRatio'], 'must not exceed criticalSpeed.maxRatio');
    if (t.wear.warnPressureRatio > t.wear.maxPressureRatio) issue(['wear', 'warnPressureRatio'], 'must not exceed wear.maxPressureRatio');
    if (t.wear.warnPvRatio > t.wear.maxPvRatio) issue(['wear', 'warnPvRatio'], 'must not exceed wear.maxPvRatio');
    if (t.drive.warnMargin < t.drive.minMargin) issue(['drive', 'warnMargin'], 'must not be below drive.minMargin');
    if (t.engagedThreads.min > t.engagedThreads.max) issue(['engagedThreads', 'min'], 'must not exceed engagedThreads.max');
  });

/** Every configurable limit of the design rules. */
export type Thresholds = z.infer<typeof thresholdsSchema>;

/** Our own version naming: <year>.<month>-<sequence>, e.g. "2026.12-1". */
export const RULE_SET_VERSION_PATTERN = /^\d{4}\.(0[1-9]|1[0-2])-[1-9]\d*$/;

export const ruleSetDefinitionSchema = z.strictObject({
  version: z
    .string()
    .regex(RULE_SET_VERSION_PATTERN, 'version must look like "2026.12-1" (<year>.<month>-<sequence>)')
    .describe('rule-set version; stored with every revision judged under it'),
  description: z.string().trim().min(1, 'say what changed and why').max(2000),
  thresholds: thresholdsSchema,
});

export type RuleSet = z.infer<typeof ruleSetDefinitionSchema>;

/**
 * The first rule set, kept as data: revisions judged under it name it, and it must keep parsing and meaning
 * what it meant. Never change this definition; a change is a new version (below).
 * "From memory" marks a source recalled rather than read during this work.
 */
export const RULE_SET_2026_12_1: RuleSet = {
  version: '2026.12-1',
  description:
    'First Leadline rule set: self-locking on lifting duty, static strength, column buckling, whirl speed, nut wear, ' +
    'drive torque, friction data quality and engaged threads.',
  thresholds: {
    selfLocking: {
      // Common practice. Shigley 9th ed. Table 8-5: a steel/bronze thread specified dry (f >= 0.15) but later oiled
      // can drop to f = 0.10, a ratio of 1.5 (steel/steel and steel/cast iron 0.15 -> 0.11, 1.36). A margin of 1.5
      // keeps the screw holding through that change of lubrication, which is the commonest way friction falls.
      minMargin: 1.5,
    },
    strength: {
      // Common practice on yield, by analogy with ASME BTH-1 (below-the-hook lifting devices) design factors
      // N_d = 3.00 for Design Category B and 2.00 for Category A (from memory; BTH-1 does not cover screw jacks).
      // Lifting takes the stricter value because a failure drops the load.
      minSafetyFactor: { lifting: 3.0, positioning: 2.0, clamping: 2.0 },
    },
    buckling: {
      // Common practice: the strength factor plus 0.5, because the critical load is sensitive to end fixity,
      // initial crookedness and load eccentricity that the Euler and Johnson formulas leave out; Shigley 9th ed.
      // Table 4-2 restricts its "recommended" C to use with liberal factors of safety.
      minSafetyFactor: { lifting: 3.5, positioning: 2.5, clamping: 2.5 },
    },
    criticalSpeed: {
      // Common practice: run at or below 80 % of the first critical speed (from memory);
      // warn from 60 %, because end supports seldom fix the screw as fully as the theoretical factors assume.
      maxRatio: 0.8,
      warnRatio: 0.6,
    },
    wear: {
      // The allowable pressure and pV are already "safe" handbook values (Shigley 9th ed. Table 8-4, from memory;
      // Mott Table 16-1), so exceeding them blocks; warn within 20 % of them (common practice), because the
      // allowables are single values from ranges and depend on lubrication and rubbing speed.
      maxPressureRatio: 1.0,
      warnPressureRatio: 0.8,
      maxPvRatio: 1.0,
      warnPvRatio: 0.8,
    },
    drive: {
      // Common practice: 25 % torque reserve over the raise torque at maximum friction, for starting friction,
      // cold lubricant, supply-voltage drop and drive wear; warn below 50 %.
      minMargin: 1.25,
      warnMargin: 1.5,
    },
    friction: {
      // Common practice: the narrowest thread range in Shigley 9th ed. Table 8-5 is steel/brass dry, 0.15-0.19
      // (max/min 1.27). A range narrower than 1.25 is unlikely to cover real scatter unless tested on the actual pair.
      minThreadSpreadRatio: 1.25,
    },
    engagedThreads: {
      // Shigley 10th ed. Sec. 8-2 after Marshek (from memory): the first three threads carry 0.38, 0.25 and 0.18
      // of the load. Below 4 threads the first thread must carry more than the 0.38 F the engine assumes, so the
      // first-thread check becomes unconservative. Beyond about 10 threads the added threads carry little load
      // while the stripping and mean-pressure checks still share the load over all of them (optimistic).
      min: 4,
      max: 10,
    },
  },
};

/**
 * The rule set the service starts with (corrections of rule set 2026.12-2): every 2026.12-1 threshold unchanged, plus the
 * thresholds of the checks added with it. Defaults sit on the safe side; each number names its basis.
 */
export const RULE_SET_2026_12_2: RuleSet = {
  version: '2026.12-2',
  description:
    'Engineering corrections: nut bearing pressure against the rubbing speed, worse root fillet, short-nut first-thread ' +
    "share, stripping on the standard shear planes, the nut's own threads, minimum material values, tolerance classes, " +
    'missing values block on lifting duty; every 2026.12-1 threshold kept.',
  thresholds: {
    ...RULE_SET_2026_12_1.thresholds,
    nutThreads: {
      // The nut's threads carry the same load as the screw's, so they take the same factors as the
      // screw threads (strength.minSafetyFactor above, common practice by analogy with ASME BTH-1, from memory).
      minSafetyFactor: { ...RULE_SET_2026_12_1.thresholds.strength.minSafetyFactor },
    },
    missingValues: {
      // The safe side: on lifting duty a strength check that cannot be computed (e.g. no nut yield
      // strength) is never passed as "not applicable"; it blocks and names the value to give.
      onLifting: 'blocking',
    },
    brake: {
      // Common practice: the brake alone holds the load with thread friction lost (f -> 0), with a
      // factor of 2 for lining fade, wear and the dynamic torque of stopping a moving load. For comparison, hoist codes
      // ask holding brakes for at least 125 % of the hoisting torque at the brake (ASME B30.16, from memory), a torque
      // that includes friction; against the frictionless F l / (2 pi) the factor 2 is the stricter reading here.
      minHoldingFactor: 2,
    },
  },
};

/**
 * Rule set 2026.12-3: every 2026.12-2 threshold unchanged, plus the checks on the engine 1.2 figures (nut body and flange,
 * safety nut and worn thread, nut temperature, stopping a descending load, fatigue, the collar as a bearing, the
 * dynamic factor on lifting, and every figure the engine could not compute). Defaults sit on the safe side.
 */
export const RULE_SET_2026_12_3: RuleSet = {
  version: '2026.12-3',
  description:
    'Lifting checks of engine 1.2: strength on lifting duty with the dynamic factor, nut body and flange, safety nut and ' +
    'worn thread, nut temperature, brake stopping, fatigue, collar bearing; a figure the engine could not compute blocks on ' +
    'lifting duty; every 2026.12-2 threshold kept.',
  thresholds: {
    ...RULE_SET_2026_12_2.thresholds,
    dynamicFactor: {
      // EN 13001-2 Sec. 4.2.2.2 (from memory): the hoisting load is multiplied by phi_2 for the strength proof, so the
      // static minimum factors above are held against the factors divided by phi_2 on lifting duty.
      onLifting: true,
    },
    nutBody: {
      // The nut body carries the whole load like the screw: the same factors (common practice, by analogy with ASME BTH-1, from memory)
      minSafetyFactor: { ...RULE_SET_2026_12_1.thresholds.strength.minSafetyFactor },
    },
    safetyNut: {
      // Common practice: the safety nut is the last load path of a lifting design, so it takes the lifting strength minimum;
      // the worn main nut carries the load until it is replaced, so it takes the strength minimum of its duty.
      minSafetyFactor: RULE_SET_2026_12_1.thresholds.strength.minSafetyFactor.lifting,
      minWornSafetyFactor: { ...RULE_SET_2026_12_1.thresholds.strength.minSafetyFactor },
    },
    nutTemperature: {
      // Common practice: the estimated steady nut temperature must not exceed the material's service limit (margin >= 0 K);
      // the heat balance itself takes the upper ambient of IEC 60204-1 when none is given (from memory).
      minTemperatureMargin: 0,
    },
    stopping: {
      // Common practice: a brake that cannot bring a descending load to rest (brake torque at the screw not above the
      // zero-friction load torque) lets the load fall; it blocks.
      mustStop: true,
    },
    fatigue: {
      // Common practice: a Goodman factor of 1.5 on the endurance (or fatigue) strength for repeated lifting (Shigley
      // 10th ed. Sec. 6-12 uses the Goodman line; the factor 1.5 is common practice, not from a standard).
      minSafetyFactor: 1.5,
    },
    collarBearing: {
      // The allowable collar pressure is already a "safe" value of the pair (design input with its source): exceeding it blocks.
      // Static safety s_0 = C_0a / P_0a >= 1: ISO 76 / bearing catalogues ask s_0 >= 1 for normal running (common practice).
      maxPressureRatio: 1,
      minStaticSafetyFactor: 1,
    },
    notComputed: {
      // The safe side: on lifting duty a check the engine could not compute is never passed; it blocks and names the value to give.
      onLifting: 'blocking',
    },
  },
};

/**
 * Rule set 2026.12-4: every 2026.12-3 threshold unchanged, plus the wear life and the rolling thrust bearing's L10 life held
 * against the design life (duty.designLife). A design without a design life is judged exactly as under 2026.12-3; built
 * in and adoptable, not the start default.
 */
export const RULE_SET_2026_12_4: RuleSet = {
  version: '2026.12-4',
  description:
    'The wear life and the rolling thrust bearing L10 life against the design life (duty.designLife): a life short of it warns; ' +
    'every 2026.12-3 threshold kept.',
  thresholds: {
    ...RULE_SET_2026_12_3.thresholds,
    designLife: {
      // Common practice: the wear life and the L10 life (90 % reliability, ISO 281) should reach the stated design life; a
      // shorter life warns rather than blocks, because the worn-thread check and the bearing's static check guard the load
      // and a shorter life means an earlier replacement.
      minLifeRatio: 1,
    },
  },
};

/** Rule sets built into the service, oldest first; the service stores each of them at start. */
export const BUILT_IN_RULE_SETS: readonly RuleSet[] = Object.freeze([RULE_SET_2026_12_1, RULE_SET_2026_12_2, RULE_SET_2026_12_3, RULE_SET_2026_12_4]);

/**
 * The rule set new submissions are judged by until an admin adopts another (POST /api/v1/rule-sets/:version/adopt).
 * 2026.12-3: on lifting duty a check that cannot be made blocks where its failure can release the load, and is information
 * otherwise (engine-not-computed.rule.ts, DEVELOPERS.md "Rule set 2026.12-3"); revisions stored under earlier versions keep
 * their verdicts, and the impact report and re-check show which approved ones it would change.
 */
export const DEFAULT_RULE_SET: RuleSet = RULE_SET_2026_12_3;

/** Whether strength checks on lifting duty read the dynamic factors (2026.12-3 on). */
export function dynamicFactorOnLifting(t: Thresholds): boolean {
  return t.dynamicFactor?.onLifting === true;
}

/**
 * Minimum factors for the nut's own threads, for reports and margins. A definition without the group (2026.12-1, where
 * the nut-thread-root-yield rule does not run) falls back to the screw-thread strength minimum for display.
 */
export function nutThreadMinSafetyFactor(t: Thresholds): Thresholds['strength']['minSafetyFactor'] {
  return t.nutThreads?.minSafetyFactor ?? t.strength.minSafetyFactor;
}

/** Severity on lifting duty of a strength check that cannot be computed for want of a value ('info' before 2026.12-2). */
export function missingValueSeverityOnLifting(t: Thresholds): 'blocking' | 'info' {
  return t.missingValues?.onLifting ?? 'info';
}

/** Minimum brake factor, or null when the rule set has no brake group (2026.12-1: the brake rule does not run). */
export function brakeMinHoldingFactor(t: Thresholds): number | null {
  return t.brake?.minHoldingFactor ?? null;
}

/** Result of validating a posted rule set: the rule set, or issues with dotted field paths. */
export type RuleSetParseResult =
  | { readonly success: true; readonly ruleSet: RuleSet }
  | { readonly success: false; readonly issues: readonly { readonly path: string; readonly message: string }[] };

/** Validates a raw rule-set definition (e.g. an admin's POST body); never throws on bad input. */
export function parseRuleSet(raw: unknown): RuleSetParseResult {
  const r = ruleSetDefinitionSchema.safeParse(raw);
  if (r.success) return { success: true, ruleSet: r.data };
  return {
    success: false,
    issues: r.error.issues.map((i) => ({ path: i.path.map(String).join('.') || '(body)', message: i.message })),
  };
}
