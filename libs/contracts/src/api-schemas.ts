/**
 * zod schemas of the API's responses. The OpenAPI document at /api/docs is generated from these and from the
 * request schemas; clients can rely on the field names (add, never rename).
 */
import { z } from 'zod';
import { checkSchema, governingSchema } from './checks';

const num = z.number();
const nnum = z.number().nullable();
const atFriction = z.object({ atMinFriction: num, atMaxFriction: num });

export const findingSchema = z.object({
  ruleId: z.string(),
  severity: z.enum(['blocking', 'warning', 'info']),
  // null sits on the number branch: OpenAPI 3.0 allows `nullable` only beside a `type`
  measured: z.union([z.number().nullable(), z.boolean(), z.string()]),
  limit: z.union([z.number().nullable(), z.boolean(), z.string()]),
  unit: z.string().nullable(),
  message: z.string(),
  basis: z.string(),
  subject: z.string().nullable(),
});

export const evaluationSchema = z.object({
  engineVersion: z.string(),
  geometry: z.object({
    form: z.string(), size: z.string().nullable(), standard: z.string(), majorDiameter: num, pitch: num, starts: num, lead: num,
    meanDiameter: num, minorDiameter: num, threadHeight: num, crestClearance: num, nutMajorDiameter: num, flankAngle: num,
    leadAngle: num.describe('degrees'), normalFlankAngle: num.describe('degrees'), engagedThreads: num, rootThickness: num, nutRootThickness: num,
    // added with engine 1.1 (absent from evaluations stored by earlier engine versions)
    nutMinorDiameter: num.optional().describe('basic minor diameter of the nut thread D1 [m]'),
    minimumMaterial: z.object({
      toleranceClass: z.string().nullable(), majorDiameter: num, pitchDiameter: num, minorDiameter: num, nutMinorDiameter: num,
      nutPitchDiameter: num, engagedHeight: num, basis: z.string(),
    }).optional().describe('the diameters the strength, bearing and stripping checks use: a tolerance class\'s minimum material, else basic [m]'),
    minorDiameterArea: num.optional().describe('pi d_r^2 / 4 of the section the strength checks use [m^2]'),
    tensileStressArea: nnum.optional().describe('60 deg threads: tensile stress area of ISO 898-1 / ASME B1.1, for reference [m^2]; null for other forms'),
  }),
  torque: z.object({ raise: atFriction, lower: atFriction, collar: atFriction, threadRaise: atFriction, threadLower: atFriction, raiseSecAlpha: atFriction }),
  efficiency: atFriction.extend({ thread: atFriction }),
  selfLocking: z.object({ locks: z.boolean(), margin: num, boundaryFriction: num, backDrivingTorque: nnum }),
  stresses: z.object({
    body: z.object({ axial: num, torsion: num, vonMises: num, atMinFriction: z.object({ torsion: num, vonMises: num }) }),
    firstThread: z.object({ bearing: num, rootBending: num, rootShear: num, vonMises: num, load: num.optional().describe('max(0.38 F, F / n_t) [N]') }),
    nutThread: z.object({ rootBending: num, rootShear: num }).optional().describe("the nut's own threads at their root, first-thread load [Pa]"),
    mean: z.object({ bearing: num, rootBending: num, rootShear: num, vonMises: num }),
    stripping: z.object({ screw: num, nut: num, screwArea: num.optional(), nutArea: num.optional() }),
  }),
  buckling: z.object({
    applies: z.boolean(), endConditionConstant: num, endConditionBasis: z.enum(['recommended', 'theoretical']), slenderness: num,
    transitionSlenderness: num, regime: z.enum(['euler', 'johnson']).nullable(), criticalLoad: nnum, safetyFactor: nnum,
  }),
  criticalSpeed: z.object({
    rpm: num, frequencyFactor: num, operatingRpm: nnum, ratio: nnum,
    // added with engine 1.1 (absent from evaluations stored by earlier engine versions)
    span: num.optional().describe('rotating span for whirl [m]'), ends: z.string().optional().describe('end conditions of the rotating span'),
    partlyFixed: z.object({ rpm: num, frequencyFactor: num, factor: num, endConditionConstant: num, ratio: nnum }).nullable().optional()
      .describe('fixed ends taken as only partly fixed (recommended basis); null when no end is fixed or the basis is theoretical'),
  }),
  wear: z.object({
    bearingPressure: num, slidingVelocity: nnum, pv: nnum, allowablePressure: nnum, allowablePv: nnum, pressureRatio: nnum, pvRatio: nnum,
    // added with engine 1.1 (absent from evaluations stored by earlier engine versions)
    allowablePressureClass: z.string().nullable().optional().describe('which allowable applied: the class of a speed-rated table, or the single value at any speed'),
    allowablePressureSource: z.string().nullable().optional(),
    allowablePressureBasis: z.enum(['speed-rated', 'lowest-class-no-speed', 'any-speed']).nullable().optional()
      .describe("'lowest-class-no-speed' (engine 1.2): no speed given, the lowest allowable of the classes"),
  }),
  power: z.object({ input: nnum, linearSpeed: nnum, rotationalSpeed: nnum }),
  brake: z.object({
    holdingTorqueNoFriction: num.describe('F l / (2 pi) [N*m]'), holdingTorqueMinFriction: num, reverseEfficiency: num,
    location: z.enum(['screw', 'motor']), requiredTorque: num, ratedTorque: nnum, ratio: nnum,
  }).optional().describe('added with engine 1.1 (absent from evaluations stored by earlier engine versions)'),
  drive: z.object({
    availableTorque: num, requiredTorque: num, margin: num,
    // added with engine 1.1 (absent from evaluations stored by earlier engine versions)
    steadyTorque: num.optional(), loadMass: nnum.optional(), loadMassBasis: z.enum(['stated', 'weight', 'not-included']).optional(),
    angularAcceleration: nnum.optional(), screwInertia: num.optional(), loadInertia: nnum.optional(), accelerationTorque: num.optional(),
    peakTorque: num.optional(), gearbox: z.object({ ratio: num, efficiency: num, reverseEfficiency: num }).nullable().optional(),
    peakTorqueAtMotor: num.optional(), holdingTorqueAtMotor: num.optional(),
  }).nullable(),
  safetyFactors: z.object({ bodyVonMises: num, firstThreadRoot: num, strippingScrew: num, strippingNut: nnum, nutThreadRoot: nnum.optional().describe("the nut's own threads; null without a nut yield"), buckling: nnum }),
  // added with engine 1.2 (absent from evaluations stored by earlier engine versions)
  nutBody: z.object({
    outsideDiameter: num, boreDiameter: num, sectionArea: num, axialStress: num, radialForce: num, borePressure: num, hoopStress: num,
    radialStress: num, vonMises: num, safetyFactor: nnum,
    flange: z.object({ outsideDiameter: num, thickness: num, shear: num, bending: num, safetyFactor: nnum }).nullable(),
  }).nullable().optional().describe('nut body and flange stresses [Pa] (engine 1.2); null without nut.outsideDiameter'),
  safetyNut: z.object({
    length: num, gap: num, engagedThreads: num, strippingScrew: num, strippingNut: num, strippingScrewFactor: num, strippingNutFactor: nnum, gapOverPitch: num,
  }).nullable().optional().describe('safety (follower) nut as the second load path (engine 1.2)'),
  wornThread: z.object({
    wear: num, basis: z.enum(['stated', 'safety-nut-gap']), wearOverPitch: num, nutThickness: num, wornNutThickness: num, strippingNut: num, strippingNutFactor: nnum,
  }).nullable().optional().describe("the nut's threads worn by the wear allowed (engine 1.2)"),
  operation: z.object({
    stroke: nnum, travelTime: nnum, linearSpeed: nnum, rotationalSpeed: nnum, motorPower: nnum, heatPerCycle: nnum, runningPowerLoss: nnum,
    meanPowerLoss: nnum, meanPowerLossBasis: z.string().nullable().describe("'cycles-per-hour' or 'duty-cycle' (the larger when both are given); null without either"),
  }).optional().describe('stroke [m], travel time [s], speeds, motor power [W], heat per cycle [J], power losses [W] (engine 1.2)'),
  thermal: z.object({
    ambientTemperature: num, ambientBasis: z.enum(['stated', 'default']), heatTransferCoefficient: num, nutSurfaceArea: num, temperatureRise: num,
    nutTemperature: num, maxTemperature: nnum, maxTemperatureSource: z.string().nullable(), temperatureMargin: nnum,
  }).nullable().optional().describe('steady nut temperature by a heat balance [K] (engine 1.2)'),
  wearLife: z.object({
    wearCoefficient: num, wearCoefficientSource: z.string(), allowableWear: num, slidingDistance: num, runningHours: nnum, cycles: nnum, hours: nnum,
  }).nullable().optional().describe("Archard wear life from the design's wear coefficient (engine 1.2)"),
  dynamics: z.object({
    dynamicFactor: num, basis: z.enum(['stated', 'hoisting-class', 'not-lifting']), hoistingClass: z.string().nullable(), hoistingSpeed: nnum, dynamicLoad: num,
    safetyFactors: z.object({
      bodyVonMises: num, firstThreadRoot: num, strippingScrew: num, strippingNut: nnum, nutThreadRoot: nnum, buckling: nnum, nutBody: nnum, nutFlange: nnum,
      safetyNutStripping: nnum,
    }),
  }).optional().describe('dynamic factor and the strength factors divided by it (engine 1.2)'),
  stopping: z.object({
    brakeTorqueAtScrew: num, loadTorque: num, inertia: num, responseTime: num, stops: z.boolean(), stoppingAngle: nnum, stoppingDistance: nnum,
    stoppingTime: nnum, brakeEnergy: nnum,
  }).nullable().optional().describe('stopping a descending load with the brake [rad, m, s, J] (engine 1.2)'),
  fatigue: z.object({
    cycles: num, dynamicFactor: num, stressConcentration: num,
    screwRoot: z.object({
      maxStress: num, amplitude: num, mean: num, tensileStrength: num, specimenEnduranceLimit: num, surfaceFactor: num, sizeFactor: num,
      loadFactor: num, enduranceLimit: num, safetyFactor: num,
    }).nullable(),
    nutThread: z.object({ maxStress: num, amplitude: num, mean: num, tensileStrength: num, fatigueStrength: num, safetyFactor: num }).nullable(),
  }).nullable().optional().describe('Goodman fatigue of the screw root and nut threads under repeated lifting (engine 1.2)'),
  collarBearing: z.object({
    kind: z.enum(['plain', 'annular', 'rolling']), bearingPressure: nnum, allowablePressure: nnum, pressureRatio: nnum, dynamicRating: nnum,
    staticRating: nnum, rollingElement: z.string().nullable().describe("'ball' or 'roller' as stated; null: not stated (taken as roller)"), ratingSource: z.string().nullable(), ratingLife: nnum.describe('10^6 rev'),
    ratingLifeHours: nnum, staticSafetyFactor: nnum,
  }).nullable().optional().describe('the collar as a bearing: plain pressure, or rolling L10 and static safety (engine 1.2)'),
  notComputed: z.array(z.object({ subject: z.string(), missing: z.array(z.string()), reason: z.string() })).optional()
    .describe('every check the engine could not compute and the inputs it lacks (engine 1.2)'),
  findings: z.array(findingSchema),
  trace: z.record(z.string(), z.object({ formula: z.string(), inputs: z.record(z.string(), num) })),
});

export const evaluationResponseSchema = evaluationSchema.extend({
  trace: evaluationSchema.shape.trace.optional().describe('the formula trace, sent only with ?trace=true'),
  checks: z.array(checkSchema).describe("every check the rules declare and apply to the design, against the rule set's limits"),
  governing: governingSchema,
  verdict: z.enum(['blocked', 'needs-acknowledgement', 'clear']),
  ruleSetVersion: z.string(),
});

export const actorSchema = z.object({ id: z.string(), name: z.string() });

export const productSchema = z.object({
  id: z.string().uuid(), code: z.string(), name: z.string(), description: z.string().nullable(), createdAt: z.string(),
});

export const calculationSchema = z.object({ id: z.string().uuid(), productId: z.string().uuid(), title: z.string(), createdAt: z.string() });

export const submissionResultSchema = z.object({
  calculationId: z.string().uuid(), revisionId: z.string().uuid(), revision: z.number().int(),
  verdict: z.enum(['blocked', 'needs-acknowledgement', 'clear']), hash: z.string(),
});

export const revisionRecordSchema = z.object({
  id: z.string().uuid(), productId: z.string().uuid(), calculationId: z.string().uuid(), revision: z.number().int(), note: z.string().nullable(),
  input: z.unknown().describe('the design input exactly as submitted'), normalized: z.unknown().describe('the design in SI units'),
  evaluation: evaluationSchema, findings: z.array(findingSchema), verdict: z.enum(['blocked', 'needs-acknowledgement', 'clear']),
  engineVersion: z.string(), ruleSetVersion: z.string(), author: actorSchema.nullable(), createdAt: z.string(), hash: z.string(),
  previousHash: z.string().nullable(),
});

/** Review state of a revision, derived from the record (GET /calculations/:id/revisions, GET /revisions/:id). */
/** A decision's electronic signature as shown with the revision (null before a decision, or for decisions recorded before signatures). */
export const signatureSchema = z.object({
  signerId: z.string().uuid(), printedName: z.string(), meaning: z.string().describe('e.g. "approved as checking engineer"'),
  method: z.enum(['password', 'oidc']), revisionHash: z.string().describe('hash of the signed revision record'),
  signedAt: z.string().describe('date and time of signing with its UTC offset'), fingerprint: z.string().describe('first 16 hex digits of the signed decision event hash'),
});

export const revisionReviewSchema = z.object({
  state: z.enum(['submitted', 'approved', 'rejected', 'superseded', 'withdrawn']), decidedBy: actorSchema.nullable(), decidedAt: z.string().nullable(),
  signature: signatureSchema.nullable(),
});

/**
 * The shortest acknowledgement of a warning accepted with an approval: a reason the next reader can act on
 * ("Friction test booked with the supplier"), not a token word such as "ok" (common practice for sign-off notes).
 */
export const ACKNOWLEDGEMENT_MIN_LENGTH = 20;

/** One thing said on a revision: a comment (general, or on an input field, a finding or a result), a decision's comment, an acknowledgement, a withdrawal's comment. */
export const remarkSchema = z.object({
  kind: z.enum(['comment', 'decision', 'acknowledgement', 'withdrawal']),
  by: actorSchema.nullable(),
  at: z.string(),
  text: z.string(),
  // one object with either key (OpenAPI 3.0 allows `nullable` only beside a `type`, so not a nullable union)
  target: z.object({ field: z.string().optional(), finding: z.string().optional(), result: z.string().optional() }).nullable()
    .describe('what the remark is on: a design field (`field`), a finding (`finding`, its rule id) or a result (`result`, the id of one of the revision\'s `checks`); null for the revision as a whole'),
  on: z.string().nullable()
    .describe('what the remark is on, in words: an input by its label (`input “…”`), a finding by its rule id, a result by its check\'s label (`result “…”`); null for the revision as a whole'),
});

/** A revision as the revision routes answer it: the record and its review state. */
export const revisionWithReviewSchema = revisionRecordSchema.extend({ review: revisionReviewSchema });

/** One revision (GET /revisions/:id): with its checks under the rule set it was judged by, derived on reading. */
export const revisionWithChecksSchema = revisionWithReviewSchema.extend({
  remarks: z.array(remarkSchema).describe('what was said on the revision, oldest first'),
  checks: z.array(checkSchema).describe('the checks of the rule set the revision was judged by, from its stored evaluation'),
  governing: governingSchema,
});

/** GET /api/v1/revisions/:id: one revision with its checks and remarks, and every field of its input in words. */
export const revisionDetailSchema = revisionWithChecksSchema.extend({
  inputFields: z.array(z.object({ path: z.string(), label: z.string(), value: z.string() }))
    .describe('every field of the input as entered, with its label: what a comment\'s target `field` may name'),
});

export const chainVerificationSchema = z.object({
  productId: z.string().uuid(), valid: z.boolean(), links: z.number().int(), headHash: z.string().nullable(),
  firstBrokenLink: z.object({ seq: z.number(), kind: z.enum(['revision', 'event', 'product', 'calculation', 'closure']), id: z.string(), reason: z.string() }).nullable(),
});

/** GET /identity-events/verify: the identity chain recomputed; the first link or row it does not bear out. */
export const identityVerificationSchema = z.object({
  valid: z.boolean(), links: z.number().int(), headHash: z.string().nullable(),
  firstBrokenLink: z.object({ seq: z.number(), kind: z.enum(['identity-event', 'user', 'token', 'revocation']), id: z.string(), reason: z.string() }).nullable(),
});

/** Problem details (RFC 9457); some problems add members of their own (e.g. state, blocking), as the RFC allows. */
export const problemSchema = z.looseObject({
  type: z.string(), title: z.string(), status: z.number().int(), detail: z.string().optional(), instance: z.string().optional(),
  errors: z.array(z.object({ path: z.string(), message: z.string() })).optional(),
});
