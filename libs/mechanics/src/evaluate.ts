/**
 * One design in, one complete evaluation out. Pure: no I/O, no clock, no randomness.
 * Conventions follow the engine issue and docs/formulas.md; every value is traced to its formula.
 */
import type { Design } from './design';
import * as m from './mechanics';
import * as brakeMath from './brake';
import * as driveMath from './drive';
import * as whirl from './whirl';
import { pressureStepAt } from './materials';
import { liftingChecks, type LiftingChecks } from './lifting-checks';
import { minimumMaterial, type MinimumMaterial } from './tolerances';
import { DEG, threadGeometry, threadThicknessAtDepth } from './threads';

/**
 * Version of the engine that produced an evaluation; stored with every revision. Evaluations of earlier versions stay
 * as stored (their fields are a subset: see libs/contracts api-schemas, where each later field is optional).
 */
export const ENGINE_VERSION = '1.2.0';

/** A pair of values at the two ends of the friction range. */
export interface AtFriction {
  readonly atMinFriction: number;
  readonly atMaxFriction: number;
}

/** How one result was obtained: formula id and the substituted inputs (SI). */
export interface TraceEntry {
  readonly formula: string;
  readonly inputs: Readonly<Record<string, number>>;
}

/** Ratio of shear yield to tensile yield by the distortion-energy theory (Shigley 10th ed., Eq. (5-21)). */
export const SHEAR_YIELD_RATIO = 0.577;

export interface Evaluation {
  readonly engineVersion: string;
  readonly geometry: {
    readonly form: string;
    readonly size: string | null;
    readonly standard: string;
    readonly majorDiameter: number;
    readonly pitch: number;
    readonly starts: number;
    readonly lead: number;
    readonly meanDiameter: number;
    readonly minorDiameter: number;
    readonly threadHeight: number;
    readonly crestClearance: number;
    readonly nutMajorDiameter: number;
    readonly flankAngle: number;
    readonly leadAngle: number;
    readonly normalFlankAngle: number;
    readonly engagedThreads: number;
    readonly rootThickness: number;
    readonly nutRootThickness: number;
    /** Basic minor diameter of the nut (internal) thread D1 [m]: where the screw's threads strip */
    readonly nutMinorDiameter: number;
    /** The diameters the strength, bearing and stripping checks use: a tolerance class's minimum material, else basic */
    readonly minimumMaterial: MinimumMaterial;
    /** Area of the minor-diameter section the strength checks use, pi d_r^2 / 4 (minimum material with a class) [m^2] */
    readonly minorDiameterArea: number;
    /** 60 deg threads: tensile stress area of ISO 898-1 / ASME B1.1, for reference only [m^2]; null for other forms */
    readonly tensileStressArea: number | null;
  };
  readonly torque: {
    readonly raise: AtFriction;
    readonly lower: AtFriction;
    readonly collar: AtFriction;
    readonly threadRaise: AtFriction;
    readonly threadLower: AtFriction;
    /** Raise torque with the sec(alpha) approximation, for comparison only */
    readonly raiseSecAlpha: AtFriction;
  };
  readonly efficiency: AtFriction & { readonly thread: AtFriction };
  readonly selfLocking: {
    readonly locks: boolean;
    readonly margin: number;
    /** Thread friction at which the screw just holds: cos(alpha_n) tan(lambda) */
    readonly boundaryFriction: number;
    /** Torque the load exerts on the screw at minimum thread friction when it does not lock [N*m], else null */
    readonly backDrivingTorque: number | null;
  };
  readonly stresses: {
    readonly body: {
      readonly axial: number;
      readonly torsion: number;
      readonly vonMises: number;
      readonly atMinFriction: { readonly torsion: number; readonly vonMises: number };
    };
    /** vonMises: the worse of the two root fillets; load: max(0.38 F, F / n_t) [N] */
    readonly firstThread: { readonly bearing: number; readonly rootBending: number; readonly rootShear: number; readonly vonMises: number; readonly load: number };
    /** The nut's own threads at their root (first-thread load): bending and transverse shear [Pa] */
    readonly nutThread: { readonly rootBending: number; readonly rootShear: number };
    readonly mean: { readonly bearing: number; readonly rootBending: number; readonly rootShear: number; readonly vonMises: number };
    /** Stripping shear on the standard planes; areas over the engaged length [m^2] */
    readonly stripping: { readonly screw: number; readonly nut: number; readonly screwArea: number; readonly nutArea: number };
  };
  readonly buckling: {
    readonly applies: boolean;
    readonly endConditionConstant: number;
    readonly endConditionBasis: 'recommended' | 'theoretical';
    readonly slenderness: number;
    readonly transitionSlenderness: number;
    readonly regime: 'euler' | 'johnson' | null;
    readonly criticalLoad: number | null;
    readonly safetyFactor: number | null;
  };
  readonly criticalSpeed: {
    readonly rpm: number;
    readonly frequencyFactor: number;
    readonly operatingRpm: number | null;
    readonly ratio: number | null;
    /** Rotating span between bearings [m] (the column's unsupported length unless stated) */
    readonly span: number;
    /** End conditions of the rotating span (the column's unless stated) */
    readonly ends: m.EndCondition;
    /**
     * Fixed ends taken as only partly fixed (common practice), wherever an end of the rotating span is fixed, whatever
     * the column's basis (engine 1.2): simply supported shaft over L / sqrt(C_recommended); null otherwise
     */
    readonly partlyFixed: {
      readonly rpm: number;
      readonly frequencyFactor: number;
      /** n_c' / n_c [-] */
      readonly factor: number;
      readonly endConditionConstant: number;
      readonly ratio: number | null;
    } | null;
  };
  readonly wear: {
    readonly bearingPressure: number;
    readonly slidingVelocity: number | null;
    readonly pv: number | null;
    /** Allowable mean pressure at the actual rubbing speed [Pa] (the design's single value at any speed) */
    readonly allowablePressure: number | null;
    /** Which allowable applied: the class of a speed-rated table, or the design's single value at any speed */
    readonly allowablePressureClass: string | null;
    readonly allowablePressureSource: string | null;
    /**
     * 'speed-rated': chosen for the rubbing speed; 'lowest-class-no-speed': no speed given, the lowest allowable of the
     * classes (engine 1.2; before, the lowest-speed class); 'any-speed': a single value
     */
    readonly allowablePressureBasis: 'speed-rated' | 'lowest-class-no-speed' | 'any-speed' | null;
    readonly allowablePv: number | null;
    readonly pressureRatio: number | null;
    readonly pvRatio: number | null;
  };
  readonly power: { readonly input: number | null; readonly linearSpeed: number | null; readonly rotationalSpeed: number | null };
  /** Holding the load: always reported (whether or not a brake is fitted) */
  readonly brake: {
    /** Torque the load exerts with thread friction lost (f -> 0): F l / (2 pi) [N*m] */
    readonly holdingTorqueNoFriction: number;
    /** Torque a brake must hold at minimum thread friction, collar ignored (0 when self-locking) [N*m] */
    readonly holdingTorqueMinFriction: number;
    /** Reverse (back-driving) efficiency at minimum thread friction; <= 0 means the load cannot drive the screw */
    readonly reverseEfficiency: number;
    readonly location: 'screw' | 'motor';
    /** Zero-friction holding torque at the brake's shaft: T_0, or T_0 / i on the motor (engine 1.2; before, T_0 eta_r / i) [N*m] */
    readonly requiredTorque: number;
    /** Rated brake torque as stated [N*m], else null */
    readonly ratedTorque: number | null;
    /** ratedTorque / requiredTorque, else null */
    readonly ratio: number | null;
  };
  readonly drive: {
    readonly availableTorque: number;
    /** Torque the drive must deliver: peak torque at the motor (steady raise torque when nothing accelerates and no gearbox) */
    readonly requiredTorque: number;
    readonly margin: number;
    /** Raise torque at maximum friction, collar included, at the screw [N*m] */
    readonly steadyTorque: number;
    /** Mass moved with the nut [kg]: stated, F / g on lifting duty, else null (not included) */
    readonly loadMass: number | null;
    readonly loadMassBasis: 'stated' | 'weight' | 'not-included';
    /** Angular acceleration of the screw [rad/s^2], null when none is given */
    readonly angularAcceleration: number | null;
    readonly screwInertia: number;
    /** Load inertia referred to the screw [kg*m^2], null without a load mass */
    readonly loadInertia: number | null;
    /** Torque to accelerate screw and load, at the screw [N*m] (0 when no acceleration is given) */
    readonly accelerationTorque: number;
    /** Steady plus acceleration torque at the screw [N*m] */
    readonly peakTorque: number;
    readonly gearbox: { readonly ratio: number; readonly efficiency: number; readonly reverseEfficiency: number } | null;
    /** Peak torque referred to the motor through the gearbox [N*m] (= peakTorque without one) */
    readonly peakTorqueAtMotor: number;
    /** Zero-friction holding torque referred to the motor, T_0 / i (engine 1.2; before, T_0 eta_r / i) [N*m] */
    readonly holdingTorqueAtMotor: number;
  } | null;
  /** Capacity over demand for each strength check (yield-based; shear against 0.577 S_y) */
  readonly safetyFactors: {
    readonly bodyVonMises: number;
    readonly firstThreadRoot: number;
    readonly strippingScrew: number;
    readonly strippingNut: number | null;
    /** Nut's own threads: root bending against S_y and root shear against 0.577 S_y of the nut, the lower; null without a nut yield */
    readonly nutThreadRoot: number | null;
    readonly buckling: number | null;
  };
  // Engine 1.2 groups (absent from evaluations stored by earlier versions): see lifting-checks.ts
  readonly nutBody?: LiftingChecks['nutBody'];
  readonly safetyNut?: LiftingChecks['safetyNut'];
  readonly wornThread?: LiftingChecks['wornThread'];
  readonly operation?: LiftingChecks['operation'];
  readonly thermal?: LiftingChecks['thermal'];
  readonly wearLife?: LiftingChecks['wearLife'];
  readonly dynamics?: LiftingChecks['dynamics'];
  readonly stopping?: LiftingChecks['stopping'];
  readonly fatigue?: LiftingChecks['fatigue'];
  readonly collarBearing?: LiftingChecks['collarBearing'];
  /** Every check the engine could not compute, with the inputs it lacks (engine 1.2) */
  readonly notComputed?: LiftingChecks['notComputed'];
  /** Filled by the rules module; the engine itself judges nothing */
  readonly findings: readonly unknown[];
  /** Formula id and substituted inputs behind each result, keyed by result path */
  readonly trace: Readonly<Record<string, TraceEntry>>;
}

/**
 * Evaluates a validated design in engine units.
 * Self-locking is judged at the minimum thread friction (thread alone, collar ignored: the safe side);
 * drive sizing and body torsion use the maximum friction, collar included.
 */
export function evaluate(design: Design): Evaluation {
  const { thread, load, friction, collar, nut, screw, duty } = design;
  const g = threadGeometry(thread);
  const F = load.axial;
  const Fsigned = load.sense === 'compression' ? -F : F;
  const { lead: l, meanDiameter: dm, pitch: p } = g;
  // Strength, bearing and stripping use the minimum-material diameters of a named tolerance class (basic without one)
  const mm = minimumMaterial(g, thread.toleranceClass ?? null);
  const dr = mm.minorDiameter;
  const h = mm.engagedHeight;
  const alpha = g.flankAngle * DEG;
  const lambda = m.leadAngle(l, dm);
  const alphaN = m.normalFlankAngle(alpha, lambda);
  const nt = nut.length / p;
  // Every entry is stored under a literal key (trace['a.b'] = entry(...)), never through a helper taking the path:
  // V8 keeps an object built by named stores in fast mode, while one built by ~20+ keyed stores turns into a
  // dictionary, which costs about 13 us more per evaluation to build and walk (docs/performance.md).
  const trace: Record<string, TraceEntry> = {};
  const entry = (formula: string, inputs: Record<string, number>): TraceEntry => ({ formula, inputs });

  trace['geometry.lead'] = entry('lead', { n_s: thread.starts, p });
  trace['geometry.meanDiameter'] = entry(g.meanDiameterFormula, { d: g.majorDiameter, p });
  trace['geometry.minorDiameter'] = entry(g.minorDiameterFormula, { d: g.majorDiameter, p, a_c: g.crestClearance });
  trace['geometry.leadAngle'] = entry('lead-angle', { l, d_m: dm });
  trace['geometry.normalFlankAngle'] = entry('normal-flank-angle', { alpha: g.flankAngle, lambda: lambda / DEG });
  trace['geometry.engagedThreads'] = entry('engaged-threads', { L_nut: nut.length, p });
  if (g.form === 'iso-metric' || g.form === 'unified') {
    trace['geometry.tensileStressArea'] = entry(g.form === 'iso-metric' ? 'tensile-stress-area-iso' : 'tensile-stress-area-unified', { d: g.majorDiameter, p });
  }

  // Torques at both ends of the friction range
  const fMin = friction.thread.min;
  const fMax = friction.thread.max;
  const fc = friction.collar ?? { min: 0, max: 0 };
  const collarTorque = (f: number): { value: number; formula: string; inputs: Record<string, number> } => {
    switch (collar.kind) {
      case 'plain':
        return { value: m.collarTorqueMeanDiameter(F, f, collar.meanDiameter), formula: 'collar-torque-plain', inputs: { F, f_c: f, d_c: collar.meanDiameter } };
      case 'rolling':
        return { value: m.collarTorqueMeanDiameter(F, f, collar.meanDiameter), formula: 'collar-torque-rolling', inputs: { F, f_c: f, d_c: collar.meanDiameter } };
      case 'annular': {
        const inputs = { F, f_c: f, D_o: collar.outerDiameter, D_i: collar.innerDiameter };
        return collar.model === 'uniform-wear'
          ? { value: m.collarTorqueUniformWear(F, f, collar.outerDiameter, collar.innerDiameter), formula: 'collar-torque-uniform-wear', inputs }
          : { value: m.collarTorqueUniformPressure(F, f, collar.outerDiameter, collar.innerDiameter), formula: 'collar-torque-uniform-pressure', inputs };
      }
      case 'none':
        return { value: 0, formula: 'collar-torque-plain', inputs: { F, f_c: 0, d_c: 0 } };
    }
  };
  const cMin = collarTorque(fc.min);
  const cMax = collarTorque(fc.max);
  const trMin = m.raiseTorque(F, dm, l, fMin, alphaN);
  const trMax = m.raiseTorque(F, dm, l, fMax, alphaN);
  const tlMin = m.lowerTorque(F, dm, l, fMin, alphaN);
  const tlMax = m.lowerTorque(F, dm, l, fMax, alphaN);
  const raise = { atMinFriction: trMin + cMin.value, atMaxFriction: trMax + cMax.value };
  const lower = { atMinFriction: tlMin + cMin.value, atMaxFriction: tlMax + cMax.value };
  const threadInputs = (f: number) => ({ F, d_m: dm, l, f, alpha_n: alphaN / DEG });
  trace['torque.threadRaise.atMinFriction'] = entry('thread-raise-torque', threadInputs(fMin));
  trace['torque.threadRaise.atMaxFriction'] = entry('thread-raise-torque', threadInputs(fMax));
  trace['torque.threadLower.atMinFriction'] = entry('thread-lower-torque', threadInputs(fMin));
  trace['torque.threadLower.atMaxFriction'] = entry('thread-lower-torque', threadInputs(fMax));
  trace['torque.collar.atMinFriction'] = entry(cMin.formula, cMin.inputs);
  trace['torque.collar.atMaxFriction'] = entry(cMax.formula, cMax.inputs);
  trace['torque.raise.atMinFriction'] = entry('raise-torque-total', { T_thread: trMin, T_c: cMin.value });
  trace['torque.raise.atMaxFriction'] = entry('raise-torque-total', { T_thread: trMax, T_c: cMax.value });
  trace['torque.lower.atMinFriction'] = entry('lower-torque-total', { T_thread: tlMin, T_c: cMin.value });
  trace['torque.lower.atMaxFriction'] = entry('lower-torque-total', { T_thread: tlMax, T_c: cMax.value });
  const secInputs = (f: number) => ({ F, d_m: dm, l, f, alpha: g.flankAngle });
  trace['torque.raiseSecAlpha.atMinFriction'] = entry('thread-raise-torque-sec-alpha', secInputs(fMin));
  trace['torque.raiseSecAlpha.atMaxFriction'] = entry('thread-raise-torque-sec-alpha', secInputs(fMax));

  const eff = { atMinFriction: m.efficiency(F, l, raise.atMinFriction), atMaxFriction: m.efficiency(F, l, raise.atMaxFriction) };
  const effThread = { atMinFriction: m.efficiency(F, l, trMin), atMaxFriction: m.efficiency(F, l, trMax) };
  trace['efficiency.atMinFriction'] = entry('efficiency', { F, l, T: raise.atMinFriction });
  trace['efficiency.atMaxFriction'] = entry('efficiency', { F, l, T: raise.atMaxFriction });
  trace['efficiency.thread.atMinFriction'] = entry('efficiency', { F, l, T: trMin });
  trace['efficiency.thread.atMaxFriction'] = entry('efficiency', { F, l, T: trMax });

  const margin = m.selfLockingMargin(fMin, lambda, alphaN);
  const locks = margin > 1;
  trace['selfLocking.margin'] = entry('self-locking-margin', { f_min: fMin, lambda: lambda / DEG, alpha_n: alphaN / DEG });
  if (!locks) trace['selfLocking.backDrivingTorque'] = entry('back-driving-torque', threadInputs(fMin));

  // Holding the load: always reported; the brake's requirement takes thread friction as lost (f -> 0)
  const gearbox = design.drive?.gearbox ?? null;
  const holdNoFriction = brakeMath.holdingTorqueNoFriction(F, l);
  const holdMinFriction = brakeMath.holdingTorqueAtFriction(F, dm, l, fMin, alphaN);
  const reverseEff = brakeMath.reverseEfficiency(F, dm, l, fMin, alphaN);
  // A motor-side brake: friction lost on the thread is lost in the gearbox too, so its reverse efficiency is not credited
  const holdAtMotor = gearbox ? driveMath.motorHoldingTorqueNoFriction(holdNoFriction, gearbox.ratio) : holdNoFriction;
  const brakeLocation = duty.brakeLocation ?? 'screw';
  const brakeRequired = brakeLocation === 'motor' ? holdAtMotor : holdNoFriction;
  const brakeRated = duty.brakeTorque ?? null;
  trace['brake.holdingTorqueNoFriction'] = entry('brake-holding-torque-no-friction', { F, l });
  trace['brake.holdingTorqueMinFriction'] = entry('brake-holding-torque-min-friction', threadInputs(fMin));
  trace['brake.reverseEfficiency'] = entry('reverse-efficiency', threadInputs(fMin));
  if (brakeLocation === 'motor' && gearbox) {
    trace['brake.requiredTorque'] = entry('motor-holding-torque-no-friction', { T_0: holdNoFriction, i: gearbox.ratio });
  }
  if (brakeRated !== null) trace['brake.ratio'] = entry('brake-torque-ratio', { T_brake: brakeRated, T_0: brakeRequired });

  // Body stresses: torsion from the total raise torque at maximum friction (conservative)
  const axial = m.bodyAxialStress(Fsigned, dr);
  const torsion = m.bodyTorsionStress(raise.atMaxFriction, dr);
  const torsionMin = m.bodyTorsionStress(raise.atMinFriction, dr);
  const bodyVm = m.vonMisesAxialTorsion(axial, torsion);
  trace['stresses.body.axial'] = entry('body-axial-stress', { F: Fsigned, d_r: dr });
  trace['stresses.body.torsion'] = entry('body-torsion-stress', { T: raise.atMaxFriction, d_r: dr });
  trace['stresses.body.vonMises'] = entry('von-mises-axial-torsion', { sigma: axial, tau: torsion });

  // Thread stresses: cantilever arm from the pitch line to the root, root thickness on the straight flanks
  // The flank load acts mid-way up the contact band (the mean diameter on the basic profile; moved with the band's
  // edges, the screw's major and the nut's minor diameter, at minimum material); thicknesses follow each part's pitch diameter
  const loadDiameter = dm + (mm.majorDiameter - g.majorDiameter + (mm.nutMinorDiameter - g.nutMinorDiameter)) / 2;
  const arm = (loadDiameter - dr) / 2;
  const b = threadThicknessAtDepth(g, (mm.pitchDiameter - dr) / 2);
  const bNut = threadThicknessAtDepth(g, (g.nutMajorDiameter - mm.nutPitchDiameter) / 2);
  const threadStresses = (Ft: number) => {
    const bending = m.threadRootBending(Ft, dr, arm, b);
    return {
      bearing: m.threadBearingStress(Ft, dm, h),
      rootBending: bending,
      rootShear: m.threadRootShear(Ft, dr, b),
      vonMises: m.rootVonMisesWorseFillet(bending, axial, torsion),
    };
  };
  const Ffirst = m.firstThreadLoad(F, nt);
  const Fmean = F / nt;
  const first = threadStresses(Ffirst);
  const mean = threadStresses(Fmean);
  trace['stresses.firstThread.bearing'] = entry('thread-bearing-stress', { F_t: Ffirst, d_m: dm, h });
  trace['stresses.firstThread.rootBending'] = entry('thread-root-bending', { F_t: Ffirst, d_r: dr, a: arm, b });
  trace['stresses.firstThread.rootShear'] = entry('thread-root-shear', { F_t: Ffirst, d_r: dr, b });
  trace['stresses.firstThread.vonMises'] = entry('thread-root-von-mises', { sigma_b: first.rootBending, sigma: axial, tau: torsion });
  trace['stresses.mean.bearing'] = entry('thread-bearing-stress', { F_t: Fmean, d_m: dm, h });
  trace['stresses.mean.rootBending'] = entry('thread-root-bending', { F_t: Fmean, d_r: dr, a: arm, b });
  trace['stresses.mean.rootShear'] = entry('thread-root-shear', { F_t: Fmean, d_r: dr, b });
  trace['stresses.mean.vonMises'] = entry('thread-root-von-mises', { sigma_b: mean.rootBending, sigma: axial, tau: torsion });
  trace['stresses.firstThread.load'] = entry('thread-load-share-first', { F, n_t: nt });
  // Stripping on the standard shear planes: the screw's threads at the nut's minor diameter, the nut's at the screw's major
  const D1 = mm.nutMinorDiameter;
  const tScrew = threadThicknessAtDepth(g, (mm.pitchDiameter - D1) / 2);
  const tNut = threadThicknessAtDepth(g, (mm.majorDiameter - mm.nutPitchDiameter) / 2);
  const stripScrewArea = m.strippingArea(D1, tScrew, nt);
  const stripNutArea = m.strippingArea(mm.majorDiameter, tNut, nt);
  const stripScrew = F / stripScrewArea;
  const stripNut = F / stripNutArea;
  trace['stresses.stripping.screw'] = entry('thread-stripping-screw', { F, D_1: D1, t_s: tScrew, n_t: nt });
  trace['stresses.stripping.nut'] = entry('thread-stripping-nut', { F, d: mm.majorDiameter, t_n: tNut, n_t: nt });
  // The nut's own threads: a cantilever of width pi D4 from the nut root to the pitch line, first-thread load
  const nutArm = (g.nutMajorDiameter - loadDiameter) / 2;
  const nutBending = m.threadRootBending(Ffirst, g.nutMajorDiameter, nutArm, bNut);
  const nutShear = m.threadRootShear(Ffirst, g.nutMajorDiameter, bNut);
  trace['stresses.nutThread.rootBending'] = entry('nut-thread-root-bending', { F_t: Ffirst, D_4: g.nutMajorDiameter, a_n: nutArm, b_n: bNut });
  trace['stresses.nutThread.rootShear'] = entry('nut-thread-root-shear', { F_t: Ffirst, D_4: g.nutMajorDiameter, b_n: bNut });

  // Column
  const C = m.END_CONDITION_CONSTANT[screw.endConditionBasis][screw.ends];
  const k = dr / 4;
  const L = screw.unsupportedLength;
  const slenderness = L / k;
  const transition = m.transitionSlenderness(C, screw.elasticModulus, screw.yieldStrength);
  const area = (Math.PI * dr * dr) / 4;
  const compressed = load.sense === 'compression';
  const regime = !compressed ? null : slenderness >= transition ? 'euler' : 'johnson';
  const criticalLoad =
    regime === 'euler'
      ? m.eulerCriticalLoad(C, screw.elasticModulus, area, slenderness)
      : regime === 'johnson'
        ? m.johnsonCriticalLoad(C, screw.elasticModulus, screw.yieldStrength, area, slenderness)
        : null;
  const bucklingFactor = criticalLoad === null ? null : criticalLoad / F;
  trace['buckling.slenderness'] = entry('slenderness', { l: L, k });
  trace['buckling.transitionSlenderness'] = entry('transition-slenderness', { C, E: screw.elasticModulus, S_y: screw.yieldStrength });
  if (regime) {
    trace['buckling.criticalLoad'] = entry(regime === 'euler' ? 'euler-critical-load' : 'johnson-critical-load', {
      C, E: screw.elasticModulus, S_y: screw.yieldStrength, A: area, 'l/k': slenderness,
    });
    trace['buckling.safetyFactor'] = entry('buckling-safety-factor', { P_cr: criticalLoad as number, F });
  }

  // Speeds, whirl, wear and power
  const rpm = duty.speed ?? (duty.linearSpeed !== null ? (duty.linearSpeed / l) * 60 : null);
  const n = rpm === null ? null : rpm / 60;
  const whirlSpan = screw.whirlSpan ?? L;
  const whirlEnds = screw.whirlEnds ?? screw.ends;
  const betaL = m.WHIRL_FREQUENCY_FACTOR[whirlEnds];
  // Stiffness of the root section, mass of the thread (pitch diameter)
  const dmMass = mm.pitchDiameter;
  const nc = m.criticalSpeedRpmThreadMass(betaL, dr, dmMass, whirlSpan, screw.elasticModulus, screw.density);
  trace['criticalSpeed.rpm'] = entry('critical-speed-thread-mass', { beta_1L: betaL, d_r: dr, d_m: dmMass, L: whirlSpan, E: screw.elasticModulus, rho: screw.density });
  if (rpm !== null) trace['criticalSpeed.ratio'] = entry('critical-speed-ratio', { n: rpm, n_c: nc });
  // Fixed ends only partly fixed, with the partial fixity the recommended column constants assume (common practice);
  // a property of the bearings, so independent of the basis the column check uses
  let partlyFixed: Evaluation['criticalSpeed']['partlyFixed'] = null;
  if (whirlEnds.startsWith('fixed')) {
    const Cw = m.END_CONDITION_CONSTANT.recommended[whirlEnds];
    const betaLp = whirl.partlyFixedFrequencyFactor(Cw);
    const ncp = m.criticalSpeedRpmThreadMass(betaLp, dr, dmMass, whirlSpan, screw.elasticModulus, screw.density);
    partlyFixed = { rpm: ncp, frequencyFactor: betaLp, factor: whirl.partlyFixedSpeedFactor(Cw, betaL), endConditionConstant: Cw, ratio: rpm === null ? null : rpm / ncp };
    trace['criticalSpeed.partlyFixed.frequencyFactor'] = entry('critical-speed-partly-fixed', { C: Cw });
    trace['criticalSpeed.partlyFixed.rpm'] = entry('critical-speed-thread-mass', { beta_1L: betaLp, d_r: dr, d_m: dmMass, L: whirlSpan, E: screw.elasticModulus, rho: screw.density });
    trace['criticalSpeed.partlyFixed.factor'] = entry('critical-speed-partly-fixed-factor', { C: Cw, beta_1L: betaL });
    if (rpm !== null) trace['criticalSpeed.partlyFixed.ratio'] = entry('critical-speed-ratio', { n: rpm, n_c: ncp });
  }

  const pressure = m.nutBearingPressure(F, dm, h, nt);
  const vs = n === null ? null : m.slidingVelocity(dm, n, lambda);
  const pv = vs === null ? null : pressure * vs;
  // Allowable pressure: the design's single value at any speed, else the speed-rated step for the actual rubbing speed
  const step = nut.allowablePressure === null && nut.pressureBySpeed ? pressureStepAt(nut.pressureBySpeed, vs) : null;
  const allowablePressure = nut.allowablePressure ?? step?.allowablePressure ?? null;
  const allowablePressureBasis = nut.allowablePressure !== null ? 'any-speed' : step ? (vs === null ? 'lowest-class-no-speed' : 'speed-rated') : null;
  const allowablePressureClass =
    nut.allowablePressure !== null
      ? "the design's own value, used at any rubbing speed"
      : step === null
        ? null
        : vs === null
          ? `${step.application}; no operating speed was given, so the lowest allowable of the speed classes is used (the most conservative)`
          : step.application;
  if (allowablePressureBasis === 'lowest-class-no-speed' && allowablePressure !== null && nut.pressureBySpeed) {
    trace['wear.allowablePressure'] = entry('allowable-pressure-no-speed', { p_allow: allowablePressure, classes: nut.pressureBySpeed.length });
  }
  const allowablePressureSource = nut.allowablePressure !== null ? 'design input (nut.allowablePressure)' : (step?.source ?? null);
  trace['wear.bearingPressure'] = entry('nut-bearing-pressure', { F, d_m: dm, h, n_t: nt });
  if (vs !== null) {
    trace['wear.slidingVelocity'] = entry('sliding-velocity', { d_m: dm, n: n as number, lambda: lambda / DEG });
    trace['wear.pv'] = entry('pv', { p: pressure, v_s: vs });
  }
  if (duty.linearSpeed !== null && duty.speed === null) trace['power.rotationalSpeed'] = entry('rotational-speed-from-linear', { v: duty.linearSpeed, l });
  const inputPower = n === null ? null : raise.atMaxFriction * 2 * Math.PI * n;
  const linearSpeed = n === null ? null : l * n;
  if (n !== null) {
    trace['power.input'] = entry('input-power', { T_R: raise.atMaxFriction, n });
    trace['power.linearSpeed'] = entry('linear-speed', { l, n });
  }
  let drive: Evaluation['drive'] = null;
  if (design.drive) {
    const dd = design.drive;
    const steady = raise.atMaxFriction;
    const statedMass = dd.loadMass ?? null;
    const loadMass = statedMass ?? (duty.kind === 'lifting' ? driveMath.loadMassFromWeight(F) : null);
    const loadMassBasis = statedMass !== null ? 'stated' : loadMass !== null ? 'weight' : 'not-included';
    if (loadMassBasis === 'weight') trace['drive.loadMass'] = entry('load-mass-from-weight', { F });
    const Js = driveMath.screwInertia(screw.density, whirlSpan, dr, g.majorDiameter);
    trace['drive.screwInertia'] = entry('screw-inertia', { rho: screw.density, L: whirlSpan, d_r: dr, d: g.majorDiameter });
    const JL = loadMass === null ? null : driveMath.reflectedLoadInertia(loadMass, l);
    if (JL !== null && loadMass !== null) trace['drive.loadInertia'] = entry('load-inertia-reflected', { m: loadMass, l });
    // Either is accepted by the contract, never both; time to speed needs an operating speed (checked at input)
    let alphaAcc: number | null = null;
    if (dd.accelerationTime != null && n !== null) {
      alphaAcc = driveMath.angularAccelerationFromTime(n, dd.accelerationTime);
      trace['drive.angularAcceleration'] = entry('angular-acceleration-from-time', { n, t_a: dd.accelerationTime });
    } else if (dd.acceleration != null) {
      alphaAcc = driveMath.angularAccelerationFromLinear(dd.acceleration, l);
      trace['drive.angularAcceleration'] = entry('angular-acceleration-from-linear', { a_nut: dd.acceleration, l });
    }
    const accTorque = alphaAcc === null ? 0 : driveMath.accelerationTorque(Js, JL ?? 0, eff.atMaxFriction, alphaAcc);
    if (alphaAcc !== null) {
      trace['drive.accelerationTorque'] = entry('acceleration-torque', { J_s: Js, J_L: JL ?? 0, e: eff.atMaxFriction, alpha_acc: alphaAcc });
    }
    const peak = steady + accTorque;
    trace['drive.peakTorque'] = entry('peak-torque', { T_R: steady, T_a: accTorque });
    const peakAtMotor = gearbox ? driveMath.motorTorqueThroughGearbox(peak, gearbox.ratio, gearbox.efficiency) : peak;
    if (gearbox) {
      trace['drive.peakTorqueAtMotor'] = entry('motor-torque-through-gearbox', { T: peak, i: gearbox.ratio, eta_g: gearbox.efficiency });
      trace['drive.holdingTorqueAtMotor'] = entry('motor-holding-torque-no-friction', { T_0: holdNoFriction, i: gearbox.ratio });
    }
    drive = {
      availableTorque: dd.availableTorque,
      requiredTorque: peakAtMotor,
      margin: dd.availableTorque / peakAtMotor,
      steadyTorque: steady,
      loadMass,
      loadMassBasis,
      angularAcceleration: alphaAcc,
      screwInertia: Js,
      loadInertia: JL,
      accelerationTorque: accTorque,
      peakTorque: peak,
      gearbox,
      peakTorqueAtMotor: peakAtMotor,
      holdingTorqueAtMotor: holdAtMotor,
    };
    trace['drive.margin'] = entry('drive-margin', { T_av: drive.availableTorque, T_R: drive.requiredTorque });
  }

  const shearYield = SHEAR_YIELD_RATIO * screw.yieldStrength;
  const safetyFactors: Evaluation['safetyFactors'] = {
    bodyVonMises: screw.yieldStrength / bodyVm,
    firstThreadRoot: screw.yieldStrength / first.vonMises,
    strippingScrew: shearYield / stripScrew,
    strippingNut: nut.yieldStrength === null ? null : (SHEAR_YIELD_RATIO * nut.yieldStrength) / stripNut,
    nutThreadRoot:
      nut.yieldStrength === null ? null : Math.min(nut.yieldStrength / nutBending, (SHEAR_YIELD_RATIO * nut.yieldStrength) / nutShear),
    buckling: bucklingFactor,
  };
  const lifting = liftingChecks({
    design, F, lead: l, pitch: p, meanDiameter: dm, minorDiameter: dr, majorDiameter: mm.majorDiameter,
    nutMajorDiameter: g.nutMajorDiameter, nutMinorDiameter: D1, flankAngle: alpha, leadAngle: lambda, engagedThreads: nt,
    raiseTorqueMax: raise.atMaxFriction, lowerTorqueMax: lower.atMaxFriction, rpm, linearSpeed,
    holdingTorqueNoFriction: holdNoFriction, firstThreadLoad: Ffirst, screwRootVonMises: first.vonMises, nutRootBending: nutBending,
    screwStripThickness: tScrew, nutStripThickness: tNut, bearingPressure: pressure, slidingVelocity: vs,
    screwInertia: drive?.screwInertia ?? driveMath.screwInertia(screw.density, whirlSpan, dr, g.majorDiameter),
    loadMass: drive?.loadMass ?? null, staticFactors: safetyFactors, trace,
  });
  // Checks of the 1.1 groups that could not be computed, beside the new groups' own
  if (allowablePressure === null) {
    lifting.notComputed.push({ subject: 'wear.pressureRatio', missing: ['nut.allowablePressure (or nut.allowablePressureBySpeed, or a library nut.material)'], reason: 'nut wear (mean flank pressure) is not judged without an allowable pressure for the nut material' });
  }
  if (vs === null) lifting.notComputed.push({ subject: 'wear.pvRatio', missing: ['duty.speed or duty.linearSpeed'], reason: 'pV needs the rubbing speed' });
  else if (nut.allowablePv === null) lifting.notComputed.push({ subject: 'wear.pvRatio', missing: ['nut.allowablePv'], reason: 'pV is not judged without an allowable pV for the nut material' });
  if (safetyFactors.strippingNut === null) {
    lifting.notComputed.push({ subject: 'safetyFactors.strippingNut', missing: ['nut.yieldStrength'], reason: "stripping and root strength of the nut's own threads are not judged without the nut material's yield strength" });
  }
  if (rpm === null) lifting.notComputed.push({ subject: 'criticalSpeed.ratio', missing: ['duty.speed or duty.linearSpeed'], reason: 'whirl is not judged without the operating speed' });
  return {
    engineVersion: ENGINE_VERSION,
    geometry: {
      form: g.form,
      size: thread.size,
      standard: g.standard,
      majorDiameter: g.majorDiameter,
      pitch: p,
      starts: thread.starts,
      lead: l,
      meanDiameter: dm,
      minorDiameter: g.minorDiameter,
      threadHeight: g.threadHeight,
      crestClearance: g.crestClearance,
      nutMajorDiameter: g.nutMajorDiameter,
      flankAngle: g.flankAngle,
      leadAngle: lambda / DEG,
      normalFlankAngle: alphaN / DEG,
      engagedThreads: nt,
      rootThickness: b,
      nutRootThickness: bNut,
      nutMinorDiameter: g.nutMinorDiameter,
      minimumMaterial: mm,
      minorDiameterArea: area,
      tensileStressArea: g.form === 'iso-metric' || g.form === 'unified' ? m.tensileStressArea60(g.majorDiameter, p, g.form) : null,
    },
    torque: {
      raise,
      lower,
      collar: { atMinFriction: cMin.value, atMaxFriction: cMax.value },
      threadRaise: { atMinFriction: trMin, atMaxFriction: trMax },
      threadLower: { atMinFriction: tlMin, atMaxFriction: tlMax },
      raiseSecAlpha: {
        atMinFriction: m.raiseTorqueSecAlpha(F, dm, l, fMin, alpha),
        atMaxFriction: m.raiseTorqueSecAlpha(F, dm, l, fMax, alpha),
      },
    },
    efficiency: { atMinFriction: eff.atMinFriction, atMaxFriction: eff.atMaxFriction, thread: effThread },
    selfLocking: {
      locks,
      margin,
      boundaryFriction: Math.cos(alphaN) * Math.tan(lambda),
      backDrivingTorque: locks ? null : -tlMin,
    },
    stresses: {
      body: { axial, torsion, vonMises: bodyVm, atMinFriction: { torsion: torsionMin, vonMises: m.vonMisesAxialTorsion(axial, torsionMin) } },
      // Written out, not { ...first, load }: a spread followed by a key is a slow path in Node 20's V8 (docs/performance.md)
      firstThread: { bearing: first.bearing, rootBending: first.rootBending, rootShear: first.rootShear, vonMises: first.vonMises, load: Ffirst },
      nutThread: { rootBending: nutBending, rootShear: nutShear },
      mean,
      stripping: { screw: stripScrew, nut: stripNut, screwArea: stripScrewArea, nutArea: stripNutArea },
    },
    buckling: {
      applies: compressed,
      endConditionConstant: C,
      endConditionBasis: screw.endConditionBasis,
      slenderness,
      transitionSlenderness: transition,
      regime,
      criticalLoad,
      safetyFactor: bucklingFactor,
    },
    criticalSpeed: { rpm: nc, frequencyFactor: betaL, operatingRpm: rpm, ratio: rpm === null ? null : rpm / nc, span: whirlSpan, ends: whirlEnds, partlyFixed },
    wear: {
      bearingPressure: pressure,
      slidingVelocity: vs,
      pv,
      allowablePressure,
      allowablePressureClass,
      allowablePressureSource,
      allowablePressureBasis,
      allowablePv: nut.allowablePv,
      pressureRatio: allowablePressure === null ? null : pressure / allowablePressure,
      pvRatio: pv === null || nut.allowablePv === null ? null : pv / nut.allowablePv,
    },
    power: { input: inputPower, linearSpeed, rotationalSpeed: rpm },
    brake: {
      holdingTorqueNoFriction: holdNoFriction,
      holdingTorqueMinFriction: holdMinFriction,
      reverseEfficiency: reverseEff,
      location: brakeLocation,
      requiredTorque: brakeRequired,
      ratedTorque: brakeRated,
      ratio: brakeRated === null ? null : brakeRated / brakeRequired,
    },
    drive,
    safetyFactors,
    nutBody: lifting.nutBody,
    safetyNut: lifting.safetyNut,
    wornThread: lifting.wornThread,
    operation: lifting.operation,
    thermal: lifting.thermal,
    wearLife: lifting.wearLife,
    dynamics: lifting.dynamics,
    stopping: lifting.stopping,
    fatigue: lifting.fatigue,
    collarBearing: lifting.collarBearing,
    notComputed: lifting.notComputed,
    findings: [],
    trace,
  };
}
