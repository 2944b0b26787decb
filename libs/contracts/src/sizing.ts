/**
 * The screw-selection contract (POST /api/v1/sizing): requirements for one screw position and the search over the
 * standard size tables. The requirement pieces are the design input's own schemas (imported, never copied), so a
 * field a design accepts is accepted here with the same name and the same validation.
 * Field names are a contract: add fields, never rename.
 */
import { VERDICTS } from '@leadline/presentation';
import { z } from 'zod';
import { checkSchema } from './checks';
import { collarSchema, designInputSchema } from './design-input';

const design = designInputSchema.shape;

/** Forms the search can take sizes from (forms with a standard size table). */
export const SIZING_FORMS = ['trapezoidal', 'acme', 'stub-acme', 'iso-metric', 'unified'] as const;
export type SizingForm = (typeof SIZING_FORMS)[number];

export const SIZING_OBJECTIVES = ['smallest-diameter', 'lowest-torque', 'highest-efficiency', 'lightest'] as const;
export type SizingObjective = (typeof SIZING_OBJECTIVES)[number];

/** The verdicts a listed candidate can have, named as the presentation names verdicts (a blocked one never passes) */
export const SIZING_VERDICTS = Object.keys(VERDICTS).filter((v) => v !== 'blocked') as [string, ...string[]];

export const SIZING_DEFAULTS = {
  forms: ['trapezoidal', 'acme'] as SizingForm[],
  starts: [1, 2, 3, 4],
  /** Nut length as a multiple of the major diameter; common practice puts power-screw nuts at 1.5 d to 3 d */
  nutLengthRatios: [1.5, 2, 2.5, 3],
  objective: 'smallest-diameter' as SizingObjective,
  limit: 20,
} as const;

/** Collar whose mean diameter follows the screw: ratio x major diameter of each candidate. */
export const collarRatioSchema = z.strictObject({
  kind: z.enum(['plain', 'rolling']),
  meanDiameterRatio: z
    .number()
    .finite()
    .min(1, 'the collar mean diameter must be at least the screw major diameter (ratio >= 1)')
    .max(10, 'a collar mean diameter above 10 x the major diameter is not a screw collar (ratio <= 10)')
    .describe('collar (or bearing) mean diameter as a multiple of the screw major diameter, e.g. 1.6'),
});

export const sizingRequirementsSchema = z.strictObject({
  load: design.load,
  duty: design.duty,
  friction: design.friction,
  collar: z.union([collarRatioSchema, collarSchema]).describe('a collar as in a design, or { kind, meanDiameterRatio }'),
  // The nut body's outside diameter follows the thread size the search picks: given as a multiple of it; no flange
  nut: design.nut.omit({ length: true, outsideDiameter: true, flange: true })
    .extend({
      outsideDiameterRatio: z
        .number()
        .finite()
        .min(1.2, "the nut body's outside diameter must be at least 1.2 x the screw major diameter (ratio >= 1.2)")
        .max(5, 'a nut body above 5 x the major diameter is not a power-screw nut (ratio <= 5)')
        .optional()
        .describe("the nut body's outside diameter as a multiple of the screw major diameter, e.g. 1.6 (for the nut body and heat checks)"),
    })
    .describe('nut material and optional allowables as in a design; the search sets the length and, from outsideDiameterRatio, the outside diameter'),
  screw: design.screw,
  drive: design.drive,
});

export const sizingSearchSchema = z.strictObject({
  forms: z.array(z.enum(SIZING_FORMS)).min(1, 'name at least one thread form').max(SIZING_FORMS.length).optional()
    .describe('thread forms to search (default trapezoidal and acme)'),
  starts: z.array(z.number().int('starts must be a whole number').min(1, 'starts must be at least 1').max(12, 'at most 12 starts'))
    .min(1, 'name at least one number of starts').max(12).optional().describe('numbers of starts to try (default 1 to 4)'),
  majorDiameter: z
    .strictObject({
      min: z.string().max(64).optional().describe('smallest major diameter to consider, e.g. "10 mm"'),
      max: z.string().max(64).optional().describe('largest major diameter to consider, e.g. "80 mm"'),
    })
    .optional(),
  nutLength: z
    .strictObject({
      ratios: z.array(z.number().finite().min(0.5, 'a nut shorter than half the diameter is not a power-screw nut (ratio >= 0.5)').max(10, 'ratio <= 10'))
        .min(1, 'name at least one ratio').max(12).optional()
        .describe('nut lengths to try as multiples of the major diameter (default 1.5, 2, 2.5, 3)'),
    })
    .optional(),
  toleranceClass: z
    .strictObject({
      trapezoidal: z.string().max(20).optional().describe('"7H/7e" (ISO 2903; sizes without its limits are then left out)'),
      acme: z.string().max(20).optional().describe('"2G", "3G" or "4G" (ASME B1.5)'),
    })
    .optional()
    .describe("tolerance class per thread form; each candidate is judged at the class's minimum-material diameters and its design carries it"),
  objective: z.enum(SIZING_OBJECTIVES).optional().describe('how candidates are ranked (default smallest-diameter)'),
  limit: z.number().int('limit must be a whole number').min(1, 'limit must be at least 1').max(500, 'limit must not exceed 500').optional()
    .describe('most candidates listed (default 20)'),
  verdicts: z.array(z.enum(SIZING_VERDICTS, { error: `a verdict is one of ${SIZING_VERDICTS.join(', ')}` }))
    .min(1, 'name at least one verdict').max(SIZING_VERDICTS.length).optional()
    .describe('list only candidates with these verdicts, e.g. ["clear"] (default: every passing candidate)'),
});

export const sizingRequestSchema = z.strictObject({
  requirements: sizingRequirementsSchema,
  search: sizingSearchSchema.optional(),
});

export type SizingRequest = z.input<typeof sizingRequestSchema>;
export type SizingRequirements = z.output<typeof sizingRequirementsSchema>;
export type SizingSearch = z.output<typeof sizingSearchSchema>;

const nnum = z.number().nullable();
const verdict = z.enum(['blocked', 'needs-acknowledgement', 'clear']);

/** The governing check of a candidate: the declared check nearest its limit, with its label also as `check`. */
export const sizingGoverningSchema = checkSchema.extend({
  check: z.string().describe('the governing check in words (its label)'),
});

export const sizingFiguresSchema = z.object({
  raiseTorque: z.number().describe('raise torque at maximum friction, collar included [N*m]'),
  efficiency: z.number().describe('efficiency at minimum friction, collar included [-]'),
  selfLockingMargin: z.number().describe('f_min / (cos alpha_n tan lambda) [-]'),
  lowestStrengthSafetyFactor: z.number().describe('lowest factor of safety of the strength checks (body, first-thread root, stripping, nut thread root, nut body, worn thread), with the dynamic factor on lifting where the rule set says so [-]'),
  lowestStrengthCheck: z.string().describe('which strength check gives the lowest factor'),
  bucklingFactor: nnum.describe('P_cr / F; null in tension'),
  speedRatio: nnum.describe('operating over first critical speed; null without a speed'),
  nutPressureRatio: nnum.describe('mean bearing pressure over the allowable; null without an allowable'),
  pvRatio: nnum.describe('pV over the allowable pV; null without speed or allowable'),
  massPerMetre: z.number().describe('screw mass per metre of length [kg/m]'),
});

export const sizingCandidateSchema = z.object({
  rank: z.number().int(),
  size: z.string(),
  form: z.string(),
  starts: z.number().int(),
  nutLength: z.string().describe('as in the design, e.g. "54 mm"'),
  nutLengthRatio: z.number(),
  verdict,
  governing: sizingGoverningSchema.nullable(),
  checks: z.array(checkSchema).describe('every check the rules apply to the candidate, as POST /api/v1/evaluations answers them'),
  figures: sizingFiguresSchema,
  design: z.unknown().describe('a complete design input: POST it to /api/v1/evaluations for the same verdict and figures'),
});

export const sizingHeadroomSchema = z.object({
  rank: z.number().int(),
  size: z.string(),
  starts: z.number().int(),
  nutLength: z.string(),
  axialLoad: z.string().nullable().describe('largest axial load at which the candidate still passes, e.g. "15321 N"'),
  factor: nnum.describe('axialLoad over the stated load'),
  blockedBy: z.string().nullable().describe('rule that blocks just above axialLoad'),
});

export const sizingResponseSchema = z.object({
  ruleSetVersion: z.string(),
  engineVersion: z.string(),
  objective: z.enum(SIZING_OBJECTIVES),
  searched: z.number().int().describe('candidates judged (size x starts x nut length), pruned ones included'),
  evaluations: z.number().int().describe('engine evaluations run by the search'),
  pruned: z.number().int().describe('candidates judged without an evaluation of their own (their screw fails a check that does not depend on the nut)'),
  passed: z.number().int().describe('candidates not blocked (some may lie beyond the limit)'),
  candidates: z.array(sizingCandidateSchema),
  rejected: z.record(z.string(), z.number().int()).describe('rule id: count of candidates blocked first by that rule'),
  headroom: z.array(sizingHeadroomSchema),
});
