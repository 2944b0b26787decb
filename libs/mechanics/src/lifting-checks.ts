/**
 * The engine 1.2 groups of an evaluation: the nut's body and flange, the safety nut and a worn thread, operation and
 * heat, wear life, lifting dynamics, stopping a descending load, fatigue, the collar as a bearing, and the list of
 * what could not be computed. Pure: called by evaluate() with the figures it has already worked out; every value is
 * traced to its formula (literal trace keys, see docs/performance.md).
 */
import * as bearings from './bearings';
import type { Design } from './design';
import * as driveMath from './drive';
import * as dutyMath from './duty';
import * as dyn from './dynamics';
import * as fat from './fatigue';
import * as body from './nut-body';

/** A check the engine could not compute: the evaluation path it would fill and the inputs it lacks. */
export interface NotComputed {
  /** Evaluation path of the missing figure, e.g. "nutBody" or "fatigue.nutThread" */
  readonly subject: string;
  /** Input fields (or data) that would let it be computed */
  readonly missing: readonly string[];
  /** Why it matters, in a sentence */
  readonly reason: string;
}

/** Default ambient temperature when none is given: 40 C, the upper ambient of IEC 60204-1, Sec. 4.4.3 (from memory): the safe side. */
export const DEFAULT_AMBIENT_TEMPERATURE = 273.15 + 40;

interface TraceEntry {
  readonly formula: string;
  readonly inputs: Readonly<Record<string, number>>;
}

/** What evaluate() hands over: the design and the figures already computed (SI). */
export interface LiftingInputs {
  readonly design: Design;
  readonly F: number;
  readonly lead: number;
  readonly pitch: number;
  readonly meanDiameter: number;
  readonly minorDiameter: number;
  readonly majorDiameter: number;
  /** Nut major diameter D_4 (the nut body's bore at its thread root) [m] */
  readonly nutMajorDiameter: number;
  /** Nut minor diameter D_1 (minimum material) [m] */
  readonly nutMinorDiameter: number;
  /** Load-flank angle [rad] and lead angle [rad] */
  readonly flankAngle: number;
  readonly leadAngle: number;
  readonly engagedThreads: number;
  readonly raiseTorqueMax: number;
  readonly lowerTorqueMax: number;
  readonly rpm: number | null;
  readonly linearSpeed: number | null;
  readonly holdingTorqueNoFriction: number;
  readonly firstThreadLoad: number;
  readonly screwRootVonMises: number;
  readonly nutRootBending: number;
  /** Thread thicknesses on the stripping planes [m] */
  readonly screwStripThickness: number;
  readonly nutStripThickness: number;
  readonly bearingPressure: number;
  readonly slidingVelocity: number | null;
  readonly screwInertia: number;
  readonly loadMass: number | null;
  readonly staticFactors: {
    readonly bodyVonMises: number;
    readonly firstThreadRoot: number;
    readonly strippingScrew: number;
    readonly strippingNut: number | null;
    readonly nutThreadRoot: number | null;
    readonly buckling: number | null;
  };
  readonly trace: Record<string, TraceEntry>;
}

const SHEAR = 0.577; // distortion-energy shear yield ratio, Shigley 10th ed., Eq. (5-21)
const entry = (formula: string, inputs: Record<string, number>): TraceEntry => ({ formula, inputs });

/** Computes the engine 1.2 groups; see the Evaluation fields of the same names. */
export function liftingChecks(x: LiftingInputs) {
  const { design, F, trace } = x;
  const { nut, duty, collar, screw } = design;
  const lifting = duty.kind === 'lifting';
  const notComputed: NotComputed[] = [];
  const nutYield = nut.yieldStrength;
  const n = x.rpm === null ? null : x.rpm / 60;

  // Lifting dynamics: a dynamic factor on the load for the strength checks
  const stated = duty.dynamicFactor ?? null;
  const hoistingClass = stated === null && lifting ? (duty.hoistingClass ?? dyn.DEFAULT_HOISTING_CLASS) : null;
  const hoistingSpeed = hoistingClass === null ? null : (x.linearSpeed ?? 0);
  const phi = stated ?? (hoistingClass !== null ? dyn.hoistingDynamicFactor(hoistingClass, hoistingSpeed as number) : 1);
  const phiBasis: 'stated' | 'hoisting-class' | 'not-lifting' = stated !== null ? 'stated' : hoistingClass !== null ? 'hoisting-class' : 'not-lifting';
  if (hoistingClass !== null) {
    trace['dynamics.dynamicFactor'] = entry('dynamic-factor-hoisting', {
      phi_2min: dyn.HOISTING_CLASS_FACTORS[hoistingClass].phi2Min, beta_2: dyn.HOISTING_CLASS_FACTORS[hoistingClass].beta2, v_h: hoistingSpeed as number,
    });
    if (x.linearSpeed === null) {
      notComputed.push({ subject: 'dynamics.dynamicFactor', missing: ['duty.speed or duty.linearSpeed'], reason: 'without the hoisting speed the dynamic factor takes only its minimum phi_2,min; give a speed or duty.dynamicFactor' });
    }
  }
  const over = (v: number | null) => (v === null ? null : v / phi);
  const sf = x.staticFactors;

  // Nut body and flange (needs the outside diameter)
  let nutBody = null as null | {
    outsideDiameter: number; boreDiameter: number; sectionArea: number; axialStress: number; radialForce: number; borePressure: number;
    hoopStress: number; radialStress: number; vonMises: number; safetyFactor: number | null;
    flange: { outsideDiameter: number; thickness: number; shear: number; bending: number; safetyFactor: number | null } | null;
  };
  // An outside diameter inside the nut thread's root leaves no wall (the input refuses it; guarded for designs built in code)
  const Do = nut.outsideDiameter != null && nut.outsideDiameter > x.nutMajorDiameter ? nut.outsideDiameter : null;
  if (Do !== null) {
    const Di = x.nutMajorDiameter;
    const area = (Math.PI / 4) * (Do * Do - Di * Di);
    const axial = F / area;
    // The first thread's share pushes outward over one pitch of the bore
    const Fr = body.radialFlankForce(x.firstThreadLoad, x.flankAngle);
    const pBore = Fr / (Math.PI * Di * x.pitch);
    const hoop = body.lameHoopStressAtBore(pBore, Do, Di);
    // The axial stress may be tension or compression depending on how the nut is held: the worse sign governs
    const vm = Math.max(body.vonMisesPrincipal(hoop, -pBore, axial), body.vonMisesPrincipal(hoop, -pBore, -axial));
    trace['nutBody.axialStress'] = entry('nut-body-axial-stress', { F, D_o: Do, D_4: Di });
    trace['nutBody.radialForce'] = entry('nut-radial-flank-force', { F_t: x.firstThreadLoad, alpha: (x.flankAngle * 180) / Math.PI });
    trace['nutBody.borePressure'] = entry('nut-bore-pressure', { F_r: Fr, D_4: Di, p: x.pitch });
    trace['nutBody.hoopStress'] = entry('nut-body-hoop-stress', { p_i: pBore, D_o: Do, D_4: Di });
    trace['nutBody.vonMises'] = entry('nut-body-von-mises', { sigma_t: hoop, sigma_r: -pBore, sigma_a: axial });
    let flange = null as null | { outsideDiameter: number; thickness: number; shear: number; bending: number; safetyFactor: number | null };
    if (nut.flange) {
      const { outsideDiameter: Df, thickness: tf } = nut.flange;
      const shear = body.flangeShear(F, Do, tf);
      const bending = body.flangeBending(F, Df, Do, tf);
      trace['nutBody.flange.shear'] = entry('nut-flange-shear', { F, D_o: Do, t_f: tf });
      trace['nutBody.flange.bending'] = entry('nut-flange-bending', { F, D_f: Df, D_o: Do, t_f: tf });
      flange = {
        outsideDiameter: Df, thickness: tf, shear, bending,
        safetyFactor: nutYield === null ? null : Math.min(nutYield / bending, (SHEAR * nutYield) / shear),
      };
    }
    nutBody = {
      outsideDiameter: Do, boreDiameter: Di, sectionArea: area, axialStress: axial, radialForce: Fr, borePressure: pBore,
      hoopStress: hoop, radialStress: -pBore, vonMises: vm, safetyFactor: nutYield === null ? null : nutYield / vm, flange,
    };
    if (nutYield === null) notComputed.push({ subject: 'nutBody.safetyFactor', missing: ['nut.yieldStrength'], reason: "the nut body's and flange's stresses cannot be judged without the nut material's yield strength" });
  } else {
    notComputed.push({ subject: 'nutBody', missing: ['nut.outsideDiameter'], reason: 'the nut body (hoop stress from the flanks, axial stress) and any flange are not checked without the nut\'s outside diameter' });
  }

  // Safety (follower) nut: the second load path, and the wear allowed before it takes the load
  let safetyNut = null as null | {
    length: number; gap: number; engagedThreads: number; strippingScrew: number; strippingNut: number;
    strippingScrewFactor: number; strippingNutFactor: number | null; gapOverPitch: number;
  };
  if (nut.safetyNut) {
    const { length, gap } = nut.safetyNut;
    const ns = length / x.pitch;
    const tauS = F / (Math.PI * x.nutMinorDiameter * x.screwStripThickness * ns);
    const tauN = F / (Math.PI * x.majorDiameter * x.nutStripThickness * ns);
    trace['safetyNut.strippingScrew'] = entry('thread-stripping-screw', { F, D_1: x.nutMinorDiameter, t_s: x.screwStripThickness, n_t: ns });
    trace['safetyNut.strippingNut'] = entry('thread-stripping-nut', { F, d: x.majorDiameter, t_n: x.nutStripThickness, n_t: ns });
    safetyNut = {
      length, gap, engagedThreads: ns, strippingScrew: tauS, strippingNut: tauN,
      strippingScrewFactor: (SHEAR * screw.yieldStrength) / tauS,
      strippingNutFactor: nutYield === null ? null : (SHEAR * nutYield) / tauN,
      gapOverPitch: gap / x.pitch,
    };
    if (nutYield === null) notComputed.push({ subject: 'safetyNut.strippingNutFactor', missing: ['nut.yieldStrength'], reason: "the safety nut's own threads cannot be judged without the nut material's yield strength" });
  } else if (lifting) {
    notComputed.push({ subject: 'safetyNut', missing: ['nut.safetyNut'], reason: 'no safety (follower) nut is given: nothing holds the load once the nut threads are worn through' });
  }

  // Worn thread: the main nut's threads thinned by the wear allowed (the safety nut's gap, or a stated limit)
  let wornThread = null as null | {
    wear: number; basis: 'stated' | 'safety-nut-gap'; wearOverPitch: number; nutThickness: number; wornNutThickness: number;
    strippingNut: number; strippingNutFactor: number | null;
  };
  const wear = nut.allowableWear ?? nut.safetyNut?.gap ?? null;
  if (wear !== null) {
    const tw = body.wornThickness(x.nutStripThickness, wear);
    const tau = tw > 0 ? F / (Math.PI * x.majorDiameter * tw * x.engagedThreads) : Infinity;
    trace['wornThread.wornNutThickness'] = entry('worn-thread-thickness', { t_n: x.nutStripThickness, w: wear });
    if (tw > 0) trace['wornThread.strippingNut'] = entry('thread-stripping-nut', { F, d: x.majorDiameter, t_n: tw, n_t: x.engagedThreads });
    wornThread = {
      wear, basis: nut.allowableWear != null ? 'stated' : 'safety-nut-gap', wearOverPitch: wear / x.pitch,
      nutThickness: x.nutStripThickness, wornNutThickness: tw,
      // a thread worn through strips at any load: stress without bound, factor 0
      strippingNut: Number.isFinite(tau) ? tau : Number.MAX_VALUE,
      strippingNutFactor: nutYield === null ? null : tw > 0 ? (SHEAR * nutYield) / tau : 0,
    };
    if (nutYield === null) notComputed.push({ subject: 'wornThread.strippingNutFactor', missing: ['nut.yieldStrength'], reason: "the worn nut's threads cannot be judged without the nut material's yield strength" });
  } else if (lifting) {
    notComputed.push({ subject: 'wornThread', missing: ['nut.allowableWear or nut.safetyNut'], reason: 'no wear limit is given, so the strength of the worn nut thread is not known' });
  }

  // Operation: stroke, travel time, motor power, heat of friction
  const stroke = duty.stroke ?? null;
  const travelTime = stroke !== null && x.linearSpeed !== null ? stroke / x.linearSpeed : null;
  if (travelTime !== null) trace['operation.travelTime'] = entry('travel-time', { s: stroke as number, v: x.linearSpeed as number });
  const gearbox = design.drive?.gearbox ?? null;
  const motorPower = n === null ? null : (x.raiseTorqueMax * 2 * Math.PI * n) / (gearbox ? gearbox.efficiency : 1);
  if (motorPower !== null) trace['operation.motorPower'] = entry('motor-power', { T_R: x.raiseTorqueMax, n: n as number, eta_g: gearbox ? gearbox.efficiency : 1 });
  const heatPerCycle = stroke === null ? null : dutyMath.frictionHeatPerCycle(stroke, x.lead, x.raiseTorqueMax, x.lowerTorqueMax);
  if (heatPerCycle !== null) trace['operation.heatPerCycle'] = entry('friction-heat-per-cycle', { s: stroke as number, l: x.lead, T_R: x.raiseTorqueMax, T_L: x.lowerTorqueMax });
  const runningPowerLoss = n === null ? null : dutyMath.frictionPowerRunning(n, x.raiseTorqueMax, x.lowerTorqueMax);
  if (runningPowerLoss !== null) trace['operation.runningPowerLoss'] = entry('friction-power-running', { n: n as number, T_R: x.raiseTorqueMax, T_L: x.lowerTorqueMax });
  // Mean power: from cycles per hour and the heat per cycle, or from the duty cycle; both given: the larger
  const fromCycles = heatPerCycle !== null && duty.cyclesPerHour != null ? (heatPerCycle * duty.cyclesPerHour) / 3600 : null;
  const fromDuty = runningPowerLoss !== null && duty.dutyCycle != null ? runningPowerLoss * duty.dutyCycle : null;
  const meanPowerLoss = fromCycles === null ? fromDuty : fromDuty === null ? fromCycles : Math.max(fromCycles, fromDuty);
  const meanPowerLossBasis = meanPowerLoss === null ? null : meanPowerLoss === fromCycles ? 'cycles-per-hour' : 'duty-cycle';
  if (fromCycles !== null && meanPowerLoss === fromCycles) trace['operation.meanPowerLoss'] = entry('mean-power-loss-cycles', { Q: heatPerCycle as number, z: duty.cyclesPerHour as number });
  else if (fromDuty !== null) trace['operation.meanPowerLoss'] = entry('mean-power-loss-duty-cycle', { P_run: runningPowerLoss as number, ED: duty.dutyCycle as number });
  const operation = {
    stroke, travelTime, linearSpeed: x.linearSpeed, rotationalSpeed: x.rpm, motorPower,
    heatPerCycle, runningPowerLoss, meanPowerLoss, meanPowerLossBasis: meanPowerLossBasis as 'cycles-per-hour' | 'duty-cycle' | null,
  };
  if (meanPowerLoss === null) {
    notComputed.push({
      subject: 'operation.meanPowerLoss',
      missing: [x.rpm === null ? 'duty.speed or duty.linearSpeed' : null, 'duty.dutyCycle, or duty.stroke with duty.cyclesPerHour'].filter((v): v is string => v !== null),
      reason: 'the heat of friction against the duty cannot be estimated, so the nut temperature is not known',
    });
  }

  // Nut temperature by a steady heat balance (all friction heat into the nut, shed by its outside surface)
  let thermal = null as null | {
    ambientTemperature: number; ambientBasis: 'stated' | 'default'; heatTransferCoefficient: number; nutSurfaceArea: number;
    temperatureRise: number; nutTemperature: number; maxTemperature: number | null; maxTemperatureSource: string | null; temperatureMargin: number | null;
  };
  if (meanPowerLoss !== null && Do !== null) {
    const ambient = duty.ambientTemperature ?? DEFAULT_AMBIENT_TEMPERATURE;
    const A = dutyMath.nutOutsideSurface(Do, nut.length, x.majorDiameter);
    const h = dutyMath.NUT_HEAT_TRANSFER_COEFFICIENT;
    const rise = dutyMath.steadyTemperatureRise(meanPowerLoss, h, A);
    trace['thermal.nutSurfaceArea'] = entry('nut-outside-surface', { D_o: Do, L: nut.length, d: x.majorDiameter });
    trace['thermal.temperatureRise'] = entry('nut-temperature-rise', { P: meanPowerLoss, h, A });
    const maxT = nut.maxTemperature ?? null;
    thermal = {
      ambientTemperature: ambient, ambientBasis: duty.ambientTemperature != null ? 'stated' : 'default', heatTransferCoefficient: h,
      nutSurfaceArea: A, temperatureRise: rise, nutTemperature: ambient + rise, maxTemperature: maxT,
      maxTemperatureSource: nut.maxTemperatureSource ?? null, temperatureMargin: maxT === null ? null : maxT - (ambient + rise),
    };
  } else if (meanPowerLoss !== null) {
    notComputed.push({ subject: 'thermal', missing: ['nut.outsideDiameter'], reason: "the nut's temperature rise needs its outside surface" });
  }
  if (nut.maxTemperature != null) {
    // A polymer nut's pV limit falls with temperature; no published derating is held
    notComputed.push({ subject: 'wear.pvAtTemperature', missing: ["the nut supplier's pV limit at the nut temperature"], reason: 'a plastic nut\'s allowable pV falls as it warms; the pV check uses the room-temperature limit' });
  }

  // Wear life by Archard's law from a stated wear coefficient
  let wearLife = null as null | {
    wearCoefficient: number; wearCoefficientSource: string; allowableWear: number; slidingDistance: number;
    runningHours: number | null; cycles: number | null; hours: number | null;
  };
  const k = nut.wearCoefficient ?? null;
  if (k !== null && wear !== null) {
    const sLife = dutyMath.wearSlidingDistance(wear, x.flankAngle, k.value, x.bearingPressure);
    trace['wearLife.slidingDistance'] = entry('wear-life-archard', { w: wear, alpha: (x.flankAngle * 180) / Math.PI, k: k.value, p: x.bearingPressure });
    const runningHours = x.slidingVelocity === null ? null : sLife / x.slidingVelocity / 3600;
    const perTravel = dutyMath.slidingPerTravel(x.meanDiameter, x.lead, x.leadAngle);
    const cycles = stroke === null ? null : sLife / (2 * stroke * perTravel);
    if (cycles !== null) trace['wearLife.cycles'] = entry('sliding-per-travel', { d_m: x.meanDiameter, l: x.lead, lambda: (x.leadAngle * 180) / Math.PI });
    const hours = cycles !== null && duty.cyclesPerHour != null ? cycles / duty.cyclesPerHour : runningHours !== null && duty.dutyCycle != null ? runningHours / duty.dutyCycle : null;
    wearLife = { wearCoefficient: k.value, wearCoefficientSource: k.source, allowableWear: wear, slidingDistance: sLife, runningHours, cycles, hours };
  } else {
    notComputed.push({
      subject: 'wearLife',
      missing: [k === null ? 'nut.wearCoefficient (with its source)' : null, wear === null ? 'nut.allowableWear or nut.safetyNut' : null].filter((v): v is string => v !== null),
      reason: 'the wear life is not computed without a wear coefficient of the thread pair and the wear allowed',
    });
  }

  // Stopping a descending load with the brake (friction lost on thread and gearbox: the safe side)
  let stopping = null as null | {
    brakeTorqueAtScrew: number; loadTorque: number; inertia: number; responseTime: number; stops: boolean;
    stoppingAngle: number | null; stoppingDistance: number | null; stoppingTime: number | null; brakeEnergy: number | null;
  };
  if (duty.brake && duty.brakeTorque != null && n !== null) {
    const motorSide = (duty.brakeLocation ?? 'screw') === 'motor';
    const i = gearbox?.ratio ?? 1;
    const Tb = motorSide ? duty.brakeTorque * i : duty.brakeTorque;
    const mass = x.loadMass ?? driveMath.loadMassFromWeight(F);
    const Jmotor = design.drive?.motorInertia != null ? design.drive.motorInertia * i * i : 0;
    const J = x.screwInertia + driveMath.reflectedLoadInertia(mass, x.lead) + Jmotor;
    const tr = duty.brakeResponseTime ?? 0;
    const omega0 = 2 * Math.PI * n;
    const st = dyn.stoppingAngle(omega0, tr, x.holdingTorqueNoFriction, Tb, J);
    trace['stopping.inertia'] = entry('stopping-inertia', { J_s: x.screwInertia, m: mass, l: x.lead, J_m: design.drive?.motorInertia ?? 0, i });
    if (st) {
      trace['stopping.stoppingAngle'] = entry('stopping-angle', { omega_0: omega0, t_r: tr, T_0: x.holdingTorqueNoFriction, T_b: Tb, J });
      trace['stopping.brakeEnergy'] = entry('brake-energy', { T_b: Tb, omega_1: st.omegaAtBrake, alpha_b: st.deceleration });
    }
    stopping = {
      brakeTorqueAtScrew: Tb, loadTorque: x.holdingTorqueNoFriction, inertia: J, responseTime: tr, stops: st !== null,
      stoppingAngle: st ? st.theta : null, stoppingDistance: st ? (st.theta * x.lead) / (2 * Math.PI) : null,
      stoppingTime: st ? st.time : null, brakeEnergy: st ? dyn.brakeEnergy(Tb, st.omegaAtBrake, st.deceleration) : null,
    };
    if (duty.brakeResponseTime == null) notComputed.push({ subject: 'stopping.responseTime', missing: ['duty.brakeResponseTime'], reason: 'the brake is taken to hold at once; the distance run during its response time is left out' });
    if (design.drive?.motorInertia == null) notComputed.push({ subject: 'stopping.inertia', missing: ['drive.motorInertia'], reason: "the motor's inertia is left out of the stopping distance" });
  } else if (duty.brake && lifting) {
    notComputed.push({
      subject: 'stopping',
      missing: [duty.brakeTorque == null ? 'duty.brakeTorque' : null, n === null ? 'duty.speed or duty.linearSpeed' : null].filter((v): v is string => v !== null),
      reason: 'the stopping distance and brake energy of a descending load need the brake torque and the speed',
    });
  }

  // Fatigue under repeated lifting: each cycle takes the stresses from 0 to the (dynamic) maximum
  let fatigue = null as null | {
    cycles: number; dynamicFactor: number; stressConcentration: number;
    screwRoot: {
      maxStress: number; amplitude: number; mean: number; tensileStrength: number; specimenEnduranceLimit: number;
      surfaceFactor: number; sizeFactor: number; loadFactor: number; enduranceLimit: number; safetyFactor: number;
    } | null;
    nutThread: { maxStress: number; amplitude: number; mean: number; tensileStrength: number; fatigueStrength: number; safetyFactor: number } | null;
  };
  if (duty.cycles != null) {
    const Kf = fat.THREAD_FATIGUE_CONCENTRATION;
    let screwRoot = null as NonNullable<typeof fatigue>['screwRoot'];
    const Sut = screw.tensileStrength ?? null;
    if (Sut !== null) {
      const smax = Kf * phi * x.screwRootVonMises;
      const Se1 = fat.specimenEnduranceLimit(Sut);
      const ka = fat.surfaceFactorMachined(Sut);
      const kb = fat.sizeFactor(x.minorDiameter);
      const kc = fat.AXIAL_LOAD_FACTOR;
      const Se = ka * kb * kc * Se1;
      trace['fatigue.screwRoot.enduranceLimit'] = entry('endurance-limit-part', { k_a: ka, k_b: kb, k_c: kc, "S_e'": Se1 });
      trace['fatigue.screwRoot.safetyFactor'] = entry('goodman-safety-factor', { sigma_a: smax / 2, sigma_m: smax / 2, S_e: Se, S_ut: Sut });
      screwRoot = {
        maxStress: smax, amplitude: smax / 2, mean: smax / 2, tensileStrength: Sut, specimenEnduranceLimit: Se1,
        surfaceFactor: ka, sizeFactor: kb, loadFactor: kc, enduranceLimit: Se, safetyFactor: fat.goodmanSafetyFactor(smax / 2, smax / 2, Se, Sut),
      };
    } else {
      notComputed.push({ subject: 'fatigue.screwRoot', missing: ['screw.tensileStrength (or a library screw.material)'], reason: 'fatigue of the screw thread root needs its tensile strength' });
    }
    let nutThread = null as NonNullable<typeof fatigue>['nutThread'];
    const nutSut = nut.tensileStrength ?? null;
    const nutSf = nut.fatigueStrength ?? null;
    if (nutSut !== null && nutSf !== null) {
      const smax = Kf * phi * x.nutRootBending;
      trace['fatigue.nutThread.safetyFactor'] = entry('goodman-safety-factor', { sigma_a: smax / 2, sigma_m: smax / 2, S_e: nutSf, S_ut: nutSut });
      nutThread = { maxStress: smax, amplitude: smax / 2, mean: smax / 2, tensileStrength: nutSut, fatigueStrength: nutSf, safetyFactor: fat.goodmanSafetyFactor(smax / 2, smax / 2, nutSf, nutSut) };
    } else {
      notComputed.push({
        subject: 'fatigue.nutThread',
        missing: [nutSf === null ? 'nut.fatigueStrength (at the design cycles)' : null, nutSut === null ? 'nut.tensileStrength' : null].filter((v): v is string => v !== null),
        reason: 'nut materials such as bronzes have no endurance limit: their fatigue strength at the design cycles must be given',
      });
    }
    fatigue = { cycles: duty.cycles, dynamicFactor: phi, stressConcentration: Kf, screwRoot, nutThread };
  } else if (lifting) {
    notComputed.push({ subject: 'fatigue', missing: ['duty.cycles'], reason: 'fatigue of the screw root and nut threads under cyclic lifting needs the number of load cycles' });
  }

  // The collar as a bearing
  let collarBearing = null as null | {
    kind: 'plain' | 'annular' | 'rolling'; bearingPressure: number | null; allowablePressure: number | null; pressureRatio: number | null;
    dynamicRating: number | null; staticRating: number | null; rollingElement: 'ball' | 'roller' | null; ratingSource: string | null;
    ratingLife: number | null; ratingLifeHours: number | null; staticSafetyFactor: number | null;
  };
  if (collar.kind === 'annular' || collar.kind === 'plain') {
    const pc = collar.kind === 'annular' ? bearings.collarBearingPressure(F, collar.outerDiameter, collar.innerDiameter) : null;
    if (collar.kind === 'annular') trace['collarBearing.bearingPressure'] = entry('collar-bearing-pressure', { F, D_o: collar.outerDiameter, D_i: collar.innerDiameter });
    const allow = collar.allowablePressure ?? null;
    collarBearing = {
      kind: collar.kind, bearingPressure: pc, allowablePressure: allow, pressureRatio: pc === null || allow === null ? null : pc / allow,
      dynamicRating: null, staticRating: null, rollingElement: null, ratingSource: null, ratingLife: null, ratingLifeHours: null, staticSafetyFactor: null,
    };
    if (pc === null) notComputed.push({ subject: 'collarBearing.bearingPressure', missing: ['collar.kind "annular" with collar.outerDiameter and collar.innerDiameter'], reason: 'a plain collar given by its mean diameter only has no bearing area' });
    if (allow === null) notComputed.push({ subject: 'collarBearing.pressureRatio', missing: ['collar.allowablePressure'], reason: 'the collar bearing pressure is not judged without an allowable for the collar pair' });
  } else if (collar.kind === 'rolling') {
    const Ca = collar.dynamicRating ?? null;
    const C0a = collar.staticRating ?? null;
    const element = collar.rollingElement ?? 'roller';
    const L10 = Ca === null ? null : bearings.ratingLife(Ca, F, bearings.LIFE_EXPONENT[element]);
    if (L10 !== null) trace['collarBearing.ratingLife'] = entry('bearing-rating-life', { C_a: Ca as number, P_a: F, p: bearings.LIFE_EXPONENT[element] });
    const L10h = L10 === null || x.rpm === null ? null : bearings.ratingLifeHours(L10, x.rpm);
    if (L10h !== null) trace['collarBearing.ratingLifeHours'] = entry('bearing-rating-life-hours', { L_10: L10 as number, n: x.rpm as number });
    const s0 = C0a === null ? null : bearings.staticSafetyFactor(C0a, F);
    if (s0 !== null) trace['collarBearing.staticSafetyFactor'] = entry('bearing-static-safety', { C_0a: C0a as number, P_0a: F });
    collarBearing = {
      kind: 'rolling', bearingPressure: null, allowablePressure: null, pressureRatio: null, dynamicRating: Ca, staticRating: C0a,
      rollingElement: collar.rollingElement ?? null, ratingSource: collar.ratingSource ?? null, ratingLife: L10, ratingLifeHours: L10h, staticSafetyFactor: s0,
    };
    const missing = [Ca === null ? 'collar.dynamicRating' : null, C0a === null ? 'collar.staticRating' : null].filter((v): v is string => v !== null);
    if (missing.length > 0) notComputed.push({ subject: 'collarBearing', missing, reason: "the rolling thrust bearing's life and static safety need its catalogue ratings" });
    if (Ca !== null && collar.rollingElement == null) notComputed.push({ subject: 'collarBearing.rollingElement', missing: ['collar.rollingElement'], reason: 'taken as a roller bearing (life exponent 10/3, the lower life for loads below the rating)' });
  }

  return {
    nutBody,
    safetyNut,
    wornThread,
    operation,
    thermal,
    wearLife,
    dynamics: {
      dynamicFactor: phi,
      basis: phiBasis,
      hoistingClass,
      hoistingSpeed,
      dynamicLoad: phi * F,
      safetyFactors: {
        bodyVonMises: sf.bodyVonMises / phi,
        firstThreadRoot: sf.firstThreadRoot / phi,
        strippingScrew: sf.strippingScrew / phi,
        strippingNut: over(sf.strippingNut),
        nutThreadRoot: over(sf.nutThreadRoot),
        buckling: over(sf.buckling),
        nutBody: over(nutBody?.safetyFactor ?? null),
        nutFlange: over(nutBody?.flange?.safetyFactor ?? null),
        safetyNutStripping: safetyNut === null ? null : over(safetyNut.strippingNutFactor === null ? safetyNut.strippingScrewFactor : Math.min(safetyNut.strippingScrewFactor, safetyNut.strippingNutFactor)),
      },
    },
    stopping,
    fatigue,
    collarBearing,
    notComputed,
  };
}

export type LiftingChecks = ReturnType<typeof liftingChecks>;
