/**
 * Test support only (not exported from the package): realistic invented designs, evaluated by the real
 * engine, for the rule specs. Material and friction values come from the engine's libraries, whose
 * sources are:
 *  - thread friction "thread/steel-bronze/oil" 0.10-0.16: Shigley 9th ed. Table 8-5 (after Rothbart & Brown);
 *  - collar friction "collar/hard-steel-bronze" 0.06-0.08: Shigley 9th ed. Table 8-6;
 *  - nut "bronze": allowable by rubbing speed, Shigley Table 8-4 (from memory): 1600 psi = 11.0 MPa up to 10 ft/min
 *    (screw jack), 800 psi to 40 ft/min (hoisting screw), 150 psi above (lead screw); pV 75,000 psi*ft/min
 *    = 2.63 MPa*m/s, Mott Table 16-1; yield 14 ksi = 96.5 MPa, ASTM B584 C93200 minimum (from memory);
 *  - nut "aluminum-bronze": the same pressure classes; pV 125,000 psi*ft/min = 4.38 MPa*m/s, Mott Table 16-1;
 *    yield 30 ksi = 207 MPa, ASTM B148 C95400 minimum (from memory);
 *  - screw "steel-1045-cd": S_y 530 MPa, Shigley Table A-20 (from memory); E 207 GPa, Shigley Table A-5.
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import { evaluate, type Design, type Evaluation } from '@leadline/mechanics';
import { DEFAULT_RULE_SET, type Thresholds } from '../rule-set';
import type { RuleContext } from '../rule';

/**
 * A 2-tonne screw jack: Tr 40x7 single start, oiled aluminium-bronze nut of 56 mm (8 threads; a tin-bronze nut's
 * own threads would fall short of the lifting factor 3 at its ASTM minimum yield), plain thrust collar,
 * 600 mm free column (fixed-free), 20 rev/min (rubbing speed 2.3 m/min: the screw-jack class of Table 8-4), 200 N*m drive. Self-locking (margin about 1.7) and clear
 * under the default rule set apart from the lifting reminder; buckling factor about 3.65 (near 3.5).
 */
export const JACK_INPUT: DesignInput = {
  thread: { form: 'trapezoidal', size: 'Tr 40x7' },
  load: { axial: '20 kN', sense: 'compression' },
  friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
  collar: { kind: 'plain', meanDiameter: '50 mm' },
  nut: { length: '56 mm', material: 'aluminum-bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '600 mm', ends: 'fixed-free' },
  duty: { kind: 'lifting', speed: '20 rpm', brake: false },
  drive: { availableTorque: '200 N*m' },
};

/**
 * A fast two-start axis: Tr 24x5 with 2 starts (lead 10 mm), oiled bronze nut of 40 mm, 5 kN, 400 mm span
 * fixed-pinned, 60 rev/min, 50 N*m drive. Not self-locking (margin about 0.70 at f = 0.10), strong otherwise.
 */
export const FAST_AXIS_INPUT: DesignInput = {
  thread: { form: 'trapezoidal', size: 'Tr 24x5', starts: 2 },
  load: { axial: '5 kN', sense: 'compression' },
  friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
  collar: { kind: 'plain', meanDiameter: '50 mm' },
  nut: { length: '40 mm', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '400 mm', ends: 'fixed-pinned' },
  duty: { kind: 'lifting', speed: '60 rpm', brake: false },
  drive: { availableTorque: '50 N*m' },
};

export interface Evaluated {
  readonly design: Design;
  readonly evaluation: Evaluation;
}

/** Parses and evaluates a design input with the real engine; throws if the input is invalid. */
export function evaluated(input: DesignInput): Evaluated {
  const parsed = parseDesign(input);
  if (!parsed.success) throw new Error(`invalid test design: ${JSON.stringify(parsed.issues)}`);
  return { design: parsed.design, evaluation: evaluate(parsed.design) };
}

/** A design input with its duty changed (kind, brake, vibration, speed). */
export function withDuty(input: DesignInput, duty: Partial<DesignInput['duty']>): DesignInput {
  return { ...input, duty: { ...input.duty, ...duty } };
}

/** A rule context under the default thresholds unless given. */
export function contextOf(e: Evaluated, thresholds: Thresholds = DEFAULT_RULE_SET.thresholds): RuleContext {
  return { design: e.design, evaluation: e.evaluation, thresholds };
}

/** Relative steps for "just above" and "just below" a threshold. */
export const JUST = { above: (x: number) => x * (1 + 1e-6), below: (x: number) => x * (1 - 1e-6) } as const;
