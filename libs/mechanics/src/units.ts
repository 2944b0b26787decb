/**
 * Unit strings at the engine's boundary: "<number> <unit>" -> SI base units.
 *
 * Conversion factors come from mathjs's unit system (exact definitions: 1 in = 0.0254 m,
 * 1 lbf = 4.4482216152605 N, 1 lb = 0.45359237 kg, as NIST SP 811 Appendix B). Each distinct
 * unit text is resolved once and cached, so a request costs a regex match and a map lookup.
 */
import { all, create, type Unit } from 'mathjs';

const math = create(all, {});
// mathjs has psi but no ksi, and no revolution-based speed units; define them from mathjs's own units.
// mathjs's psi is a rounded 6894.75729276459 Pa (off by 6e-11); NIST SP 811 defines it as lbf/in^2 exactly.
math.createUnit('psi', '1 lbf/in^2', { override: true });
math.createUnit('ksi', '1000 psi');
// "kpsi" is the same unit (Shigley's tables print kpsi); accepted as a spelling of ksi.
math.createUnit('kpsi', '1000 psi');
math.createUnit('Mpsi', '1000000 psi');
math.createUnit('rev', '1 cycle');
math.createUnit('rpm', '1 cycle/min');
math.createUnit('rps', '1 cycle/s');

/** Physical dimensions the design input uses. */
export type Dimension =
  | 'length'
  | 'force'
  | 'stress'
  | 'torque'
  | 'density'
  | 'rotationalSpeed'
  | 'linearSpeed'
  | 'angle'
  | 'pv'
  | 'mass'
  | 'time'
  | 'linearAcceleration'
  | 'temperature'
  | 'inertia'
  | 'specificWearRate'
  | 'serviceTime';

/** mathjs base-dimension exponents: [MASS, LENGTH, TIME, CURRENT, TEMPERATURE, LUMINOUS, AMOUNT, ANGLE, BIT]. */
const DIMENSIONS: Record<Dimension, number[]> = {
  length: [0, 1, 0, 0, 0, 0, 0, 0, 0],
  force: [1, 1, -2, 0, 0, 0, 0, 0, 0],
  stress: [1, -1, -2, 0, 0, 0, 0, 0, 0],
  torque: [1, 2, -2, 0, 0, 0, 0, 0, 0],
  density: [1, -3, 0, 0, 0, 0, 0, 0, 0],
  rotationalSpeed: [0, 0, -1, 0, 0, 0, 0, 1, 0],
  linearSpeed: [0, 1, -1, 0, 0, 0, 0, 0, 0],
  angle: [0, 0, 0, 0, 0, 0, 0, 1, 0],
  pv: [1, 0, -3, 0, 0, 0, 0, 0, 0],
  mass: [1, 0, 0, 0, 0, 0, 0, 0, 0],
  time: [0, 0, 1, 0, 0, 0, 0, 0, 0],
  linearAcceleration: [0, 1, -2, 0, 0, 0, 0, 0, 0],
  temperature: [0, 0, 0, 0, 1, 0, 0, 0, 0],
  inertia: [1, 2, 0, 0, 0, 0, 0, 0, 0],
  specificWearRate: [-1, 1, 2, 0, 0, 0, 0, 0, 0],
  // a time too, told apart only for its plausible range (hours of service rather than seconds of motion)
  serviceTime: [0, 0, 1, 0, 0, 0, 0, 0, 0],
};

/** What a dimension is called in error messages, with example units. */
export const DIMENSION_HINT: Record<Dimension, string> = {
  length: 'a length such as "24 mm" or "1.5 in"',
  force: 'a force such as "12 kN" or "2700 lbf"',
  stress: 'a stress such as "350 MPa" or "30 ksi"',
  torque: 'a torque such as "40 N*m" or "300 lbf*in"',
  density: 'a mass density such as "7850 kg/m^3" or "0.283 lb/in^3"',
  rotationalSpeed: 'a rotational speed such as "120 rpm"',
  linearSpeed: 'a linear speed such as "2 m/min" or "20 in/min"',
  angle: 'an angle such as "7 deg"',
  pv: 'a pressure-velocity product such as "2.5 MPa*m/s" or "75000 psi*ft/min"',
  mass: 'a mass such as "250 kg" or "550 lb"',
  time: 'a time such as "0.5 s" or "200 ms"',
  linearAcceleration: 'a linear acceleration such as "0.5 m/s^2" or "20 in/s^2"',
  temperature: 'a temperature such as "20 degC", "68 degF" or "293.15 K"',
  inertia: 'a mass moment of inertia such as "0.002 kg*m^2" or "5 lb*in^2"',
  specificWearRate: 'a specific wear rate such as "1e-6 mm^3/(N*m)"',
  serviceTime: 'a running time such as "5000 h"',
};

/**
 * The SI value the engine works in for each dimension: m, N, Pa, N*m, kg/m^3, m/s, rad, K, kg*m^2, m^2/N.
 * Rotational speed is the one exception: rev/min, the unit the Evaluation reports speeds in.
 */
const RAD_PER_S_TO_RPM = 60 / (2 * Math.PI);

/** Units that belong to the US customary system; anything else entered counts as SI. */
const US_CUSTOMARY = /(^|[^a-z])(in|inch|ft|foot|lbf|lb|lbm|psi|ksi|kpsi|Mpsi|kip|mil|degF|fahrenheit)([^a-z]|$)/;

interface ResolvedUnit {
  readonly dimension: Dimension | null;
  readonly factor: number;
  readonly usCustomary: boolean;
}

const resolved = new Map<string, ResolvedUnit | Error>();

/** The dimension a unit resolves to: a service time is a time (the two differ only in their plausible range). */
function baseDimension(d: Dimension): Dimension {
  return d === 'serviceTime' ? 'time' : d;
}

function resolveUnit(unitText: string): ResolvedUnit | Error {
  const cached = resolved.get(unitText);
  if (cached) return cached;
  let result: ResolvedUnit | Error;
  try {
    const unit: Unit = math.unit(1, unitText);
    const si = unit.toSI();
    const dims = (unit as unknown as { dimensions: number[] }).dimensions;
    const dimension =
      (Object.keys(DIMENSIONS) as Dimension[]).find((d) => DIMENSIONS[d].every((e, i) => e === dims[i])) ?? null;
    const siValue = si.toNumber();
    const factor = dimension === 'rotationalSpeed' ? siValue * RAD_PER_S_TO_RPM : siValue;
    result = { dimension, factor, usCustomary: US_CUSTOMARY.test(unitText) };
  } catch {
    result = new Error(`unknown unit "${unitText}"`);
  }
  // Bounded: an attacker sending endless distinct unit texts must not grow memory without end.
  if (resolved.size < 2000) resolved.set(unitText, result);
  return result;
}

const QUANTITY = /^\s*([-+]?(?:\d+\.?\d*|\.\d+)(?:[eE][-+]?\d+)?)\s*([^\d\s.+-].*?)\s*$/;

/** A parsed quantity in the engine's units, plus the unit system it was entered in. */
export interface Quantity {
  readonly si: number;
  readonly usCustomary: boolean;
}

/** Thrown (as a value, not an exception) when a quantity string is not acceptable. */
export class QuantityError {
  constructor(readonly message: string) {}
}

/**
 * Parses "<number> <unit>" and converts it to the engine's unit for the dimension.
 * @returns the quantity, or a QuantityError saying what is wrong (unknown unit, wrong dimension, not a number).
 */
export function parseQuantity(text: string, dimension: Dimension): Quantity | QuantityError {
  const match = QUANTITY.exec(text);
  if (!match) {
    return new QuantityError(`expected "<number> <unit>", ${DIMENSION_HINT[dimension]}; got "${text}"`);
  }
  const value = Number(match[1]);
  if (!Number.isFinite(value)) return new QuantityError(`"${text}" is not a finite number`);
  const unit = resolveUnit(match[2]);
  if (unit instanceof Error) return new QuantityError(`${unit.message}; expected ${DIMENSION_HINT[dimension]}`);
  if (unit.dimension !== baseDimension(dimension)) {
    return new QuantityError(`"${text}" is not ${DIMENSION_HINT[dimension]}`);
  }
  // Temperatures carry an offset (degC, degF): converted by mathjs to kelvin, never by a factor alone
  const si = dimension === 'temperature' ? math.unit(value, match[2]).toNumber('K') : value * unit.factor;
  // A finite number can still overflow in conversion ("1e308 GPa" is 1e317 Pa): refuse it rather than compute with Infinity
  if (!Number.isFinite(si)) return new QuantityError(`"${text}" converts to a number too large to compute with`);
  return { si, usCustomary: unit.usCustomary };
}

/** Converts an SI value (engine units) into the given unit text, for reports. */
export function fromSi(si: number, unitText: string, dimension: Dimension): number {
  const unit = resolveUnit(unitText);
  if (unit instanceof Error || unit.dimension !== baseDimension(dimension)) {
    throw new Error(`cannot express ${dimension} in "${unitText}"`);
  }
  if (dimension === 'temperature') return math.unit(si, 'K').toNumber(unitText);
  return si / unit.factor;
}
