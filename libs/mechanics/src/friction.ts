/**
 * The friction-source library: coefficient ranges for thread and collar pairs, each with its published source.
 * A design may name an entry instead of typing numbers; the record keeps the entry's values and source.
 */

export type FrictionSourceKind = 'handbook' | 'test' | 'supplier' | 'assumed';

export interface FrictionEntry {
  readonly id: string;
  readonly surface: 'thread' | 'collar';
  readonly pair: string;
  readonly lubrication: string;
  readonly min: number;
  readonly max: number;
  readonly source: { readonly kind: FrictionSourceKind; readonly reference: string };
  /** Collar entries: a sliding (plain) pair or a rolling thrust bearing; thread entries are sliding */
  readonly contact: 'sliding' | 'rolling';
}

const T85 = "Shigley's Mechanical Engineering Design, 9th ed., Table 8-5 (after Rothbart & Brown, Mechanical Design Handbook, 2nd ed.)";
const T86 = "Shigley's Mechanical Engineering Design, 9th ed., Table 8-6, running to starting (after Rothbart & Brown, 2nd ed.)";

function thread(id: string, pair: string, lubrication: string, min: number, max: number, reference = T85): FrictionEntry {
  return { id, surface: 'thread', pair, lubrication, min, max, source: { kind: 'handbook', reference }, contact: 'sliding' };
}
function collar(id: string, pair: string, min: number, max: number): FrictionEntry {
  return { id, surface: 'collar', pair, lubrication: 'lubricated', min, max, source: { kind: 'handbook', reference: T86 }, contact: 'sliding' };
}

/**
 * Rolling thrust bearings as a collar: the constant friction coefficient mu of the bearing maker's simplified friction
 * model, M = mu P d / 2 with d the bore (torque about the bore; the engine's collar torque F f d_c / 2 at the bearing's
 * mean diameter is therefore slightly high, the safe side for raising). min = the catalogue's mu; max = twice it, for
 * starting and seal drag not in the model (common practice).
 */
const SKF_MU = 'SKF Rolling bearings catalogue, "Friction": constant coefficient of friction mu for unsealed bearings (values from memory); max = 2 mu for starting and seals (common practice)';
function rolling(id: string, pair: string, mu: number): FrictionEntry {
  return { id, surface: 'collar', pair, lubrication: 'grease or oil, unsealed', min: mu, max: 2 * mu, source: { kind: 'supplier', reference: SKF_MU }, contact: 'rolling' };
}

export const FRICTION_LIBRARY: readonly FrictionEntry[] = [
  thread('thread/steel-steel/dry', 'steel screw, steel nut', 'dry', 0.15, 0.25),
  thread('thread/steel-bronze/dry', 'steel screw, bronze nut', 'dry', 0.15, 0.23),
  thread('thread/steel-brass/dry', 'steel screw, brass nut', 'dry', 0.15, 0.19),
  thread('thread/steel-cast-iron/dry', 'steel screw, cast-iron nut', 'dry', 0.15, 0.25),
  thread('thread/steel-steel/oil', 'steel screw, steel nut', 'machine oil', 0.11, 0.17),
  thread('thread/steel-bronze/oil', 'steel screw, bronze nut', 'machine oil', 0.1, 0.16),
  thread('thread/steel-brass/oil', 'steel screw, brass nut', 'machine oil', 0.1, 0.15),
  thread('thread/steel-cast-iron/oil', 'steel screw, cast-iron nut', 'machine oil', 0.11, 0.17),
  thread('thread/bronze-steel', 'bronze screw, steel nut', 'not stated by the source', 0.08, 0.12),
  thread('thread/bronze-bronze', 'bronze screw, bronze nut', 'not stated by the source', 0.04, 0.06),
  thread('thread/bronze-cast-iron', 'bronze screw, cast-iron nut', 'not stated by the source', 0.06, 0.09),
  collar('collar/soft-steel-cast-iron', 'soft steel on cast iron', 0.12, 0.17),
  collar('collar/hard-steel-cast-iron', 'hard steel on cast iron', 0.09, 0.15),
  collar('collar/soft-steel-bronze', 'soft steel on bronze', 0.08, 0.1),
  collar('collar/hard-steel-bronze', 'hard steel on bronze', 0.06, 0.08),
  rolling('collar/rolling/thrust-ball', 'thrust ball bearing', 0.0013),
  rolling('collar/rolling/cylindrical-roller-thrust', 'cylindrical roller thrust bearing', 0.005),
  rolling('collar/rolling/spherical-roller-thrust', 'spherical roller thrust bearing', 0.0018),
  rolling('collar/rolling/needle-roller-thrust', 'needle roller thrust bearing', 0.005),
];

export function findFrictionEntry(id: string): FrictionEntry | undefined {
  return FRICTION_LIBRARY.find((e) => e.id === id);
}
