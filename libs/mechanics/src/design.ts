/**
 * A design in engine units (SI base units; rotational speed in rev/min), as produced by the
 * design-input schema in libs/contracts after validation and unit conversion.
 */
import type { HoistingClass } from './dynamics';
import type { FrictionSourceKind } from './friction';
import type { PressureSpeedPoint } from './materials';
import type { EndCondition } from './mechanics';
import type { ThreadForm } from './threads';

export interface FrictionRange {
  readonly min: number;
  readonly max: number;
  readonly source: { readonly kind: FrictionSourceKind; readonly reference: string };
  /** Friction-library entry the range came from, when the design named one */
  readonly entry?: string;
}

/** A rolling thrust bearing's catalogue data (engine 1.2) */
export interface RollingBearingData {
  /** Basic dynamic axial load rating C_a [N] */
  readonly dynamicRating?: number | null;
  /** Basic static axial load rating C_0a [N] */
  readonly staticRating?: number | null;
  /** Rolling elements: ball (life exponent 3) or roller (10/3) */
  readonly rollingElement?: 'ball' | 'roller' | null;
  /** Where the ratings come from (catalogue, page) */
  readonly ratingSource?: string | null;
}

export type Collar =
  | { readonly kind: 'plain'; readonly meanDiameter: number; readonly allowablePressure?: number | null }
  | {
      readonly kind: 'annular';
      readonly outerDiameter: number;
      readonly innerDiameter: number;
      readonly model: 'uniform-wear' | 'uniform-pressure';
      /** Allowable mean bearing pressure of the collar pair [Pa] (engine 1.2) */
      readonly allowablePressure?: number | null;
    }
  | ({ readonly kind: 'rolling'; readonly meanDiameter: number } & RollingBearingData)
  | { readonly kind: 'none' };

export type DutyKind = 'lifting' | 'positioning' | 'clamping';

export interface Design {
  readonly thread: {
    readonly form: ThreadForm;
    readonly size: string | null;
    readonly majorDiameter: number;
    readonly pitch: number;
    readonly starts: number;
    readonly loadFlankAngle: number | null;
    /** Tolerance class (ISO 2903 "7H/7e", ASME B1.5 "2G"/"3G"/"4G"); absent or null: basic profile */
    readonly toleranceClass?: string | null;
  };
  readonly load: { readonly axial: number; readonly sense: 'compression' | 'tension' };
  readonly friction: { readonly thread: FrictionRange; readonly collar: FrictionRange | null };
  readonly collar: Collar;
  readonly nut: {
    readonly length: number;
    /** The material as entered: a library id, or a name of the design's own */
    readonly material: string | null;
    /** 'library' when material is a library id (it supplies the values not given), 'design' when it is the design's own */
    readonly materialSource?: 'library' | 'design' | null;
    /** A single allowable pressure of the design's own, used at any rubbing speed [Pa] */
    readonly allowablePressure: number | null;
    /** Allowable pressure by rubbing speed (library classes or the design's own pairs); used when allowablePressure is null */
    readonly pressureBySpeed?: readonly PressureSpeedPoint[] | null;
    readonly allowablePv: number | null;
    readonly yieldStrength: number | null;
    // Engine 1.2 (absent in designs normalized before): body, flange, safety nut, wear, fatigue and temperature data
    /** Outside diameter of the nut body [m] */
    readonly outsideDiameter?: number | null;
    /** Flange of a flanged nut: outside diameter and thickness [m] */
    readonly flange?: { readonly outsideDiameter: number; readonly thickness: number } | null;
    /** Safety (follower) nut: its engaged length and the axial gap before it takes the load [m] */
    readonly safetyNut?: { readonly length: number; readonly gap: number } | null;
    /** Tensile strength of the nut material [Pa] (fatigue) */
    readonly tensileStrength?: number | null;
    /** Fatigue strength of the nut material at the design's cycles [Pa] */
    readonly fatigueStrength?: number | null;
    /** Highest service temperature of the nut material [K] */
    readonly maxTemperature?: number | null;
    readonly maxTemperatureSource?: string | null;
    /** Specific wear rate k of the thread pair [m^2/N] and where it comes from */
    readonly wearCoefficient?: { readonly value: number; readonly source: string } | null;
    /** Axial wear (play) allowed before the nut is replaced [m] */
    readonly allowableWear?: number | null;
  };
  readonly screw: {
    readonly material: string | null;
    readonly yieldStrength: number;
    readonly elasticModulus: number;
    readonly density: number;
    readonly unsupportedLength: number;
    readonly ends: EndCondition;
    readonly endConditionBasis: 'recommended' | 'theoretical';
    /** Rotating span between the bearings for whirl [m]; absent or null: the column's unsupported length */
    readonly whirlSpan?: number | null;
    /** End conditions of the rotating span for whirl; absent or null: the column's ends */
    readonly whirlEnds?: EndCondition | null;
    /** Tensile strength [Pa] (fatigue; engine 1.2) */
    readonly tensileStrength?: number | null;
  };
  readonly duty: {
    readonly kind: DutyKind;
    /** Rotational speed [rev/min] when given */
    readonly speed: number | null;
    /** Linear speed [m/s] when given */
    readonly linearSpeed: number | null;
    readonly brake: boolean;
    readonly vibration: boolean;
    /** Rated static torque of the brake [N*m] at the shaft it sits on, when given */
    readonly brakeTorque?: number | null;
    /** Shaft the brake sits on: the screw (default) or the motor, ahead of the gearbox */
    readonly brakeLocation?: 'screw' | 'motor';
    // Engine 1.2
    /** Travel of the nut per stroke [m] */
    readonly stroke?: number | null;
    /** Full cycles (raise and lower one stroke) per hour */
    readonly cyclesPerHour?: number | null;
    /** Fraction of the time the screw runs [-] */
    readonly dutyCycle?: number | null;
    /** Ambient temperature [K] */
    readonly ambientTemperature?: number | null;
    /** Load cycles over the design life (fatigue) */
    readonly cycles?: number | null;
    /** Hoisting class of EN 13001-2 for the dynamic factor on lifting duty */
    readonly hoistingClass?: HoistingClass | null;
    /** Dynamic factor stated by the design (overrides the hoisting class) */
    readonly dynamicFactor?: number | null;
    /** Time from the stop command until the brake holds [s] */
    readonly brakeResponseTime?: number | null;
    /** Running time the nut thread and a rolling thrust bearing must last [s] (rule set 2026.12-4 holds the lives against it) */
    readonly designLife?: number | null;
  };
  readonly drive: {
    /** Torque the drive delivers at start [N*m]: at the motor shaft when a gearbox is given, else at the screw */
    readonly availableTorque: number;
    /** Mass moved with the nut [kg]; absent or null: F / g on lifting duty, not included otherwise */
    readonly loadMass?: number | null;
    /** Time to reach the operating speed [s] */
    readonly accelerationTime?: number | null;
    /** Linear acceleration of the nut [m/s^2] */
    readonly acceleration?: number | null;
    /** Gearbox between motor and screw: ratio motor/screw speed, forward and reverse efficiency */
    readonly gearbox?: { readonly ratio: number; readonly efficiency: number; readonly reverseEfficiency: number } | null;
    /** Mass moment of inertia of the motor's rotor (and brake disc) [kg*m^2] (engine 1.2) */
    readonly motorInertia?: number | null;
  } | null;
  /** The unit system the design was entered in; reports answer in the same one */
  readonly unitSystem: 'SI' | 'US';
}
