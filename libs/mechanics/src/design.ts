/**
 * A design in engine units (SI base units; rotational speed in rev/min), as produced by the
 * design-input schema in libs/contracts after validation and unit conversion.
 */
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

export type Collar =
  | { readonly kind: 'plain'; readonly meanDiameter: number }
  | {
      readonly kind: 'annular';
      readonly outerDiameter: number;
      readonly innerDiameter: number;
      readonly model: 'uniform-wear' | 'uniform-pressure';
    }
  | { readonly kind: 'rolling'; readonly meanDiameter: number }
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
  } | null;
  /** The unit system the design was entered in; reports answer in the same one */
  readonly unitSystem: 'SI' | 'US';
}
