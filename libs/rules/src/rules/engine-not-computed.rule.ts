/**
 * Every figure the engine could not compute (Evaluation.notComputed, engine 1.2), named with the inputs that would let it
 * be computed. Never a silent pass: on lifting duty (under rule sets that say so) an entry that is critical for lifting
 * safety blocks; an entry that is not critical is information ("not computed: give X to check Y"). Which is which is
 * declared once here (NOT_COMPUTED_CLASSES) with the reason; DEVELOPERS.md ("Rule set 2026.12-3") gives the reasoning.
 */
import type { Finding } from '@leadline/contracts';
import type { Design } from '@leadline/mechanics';
import { finding, type Rule, type RuleContext } from '../rule';

export const ENGINE_NOT_COMPUTED_ID = 'engine-not-computed';
const BASIS =
  'common practice on the safe side: a check of lifting equipment that cannot be made and whose failure can release the load ' +
  'is treated as failed until the missing value is given; a check whose failure cannot release the load (wear life, heat of a ' +
  'metal nut, a plain collar, bearing life, stopping distance) is named as information';

/** One entry of the list as the rule reads it. */
type Entry = NonNullable<RuleContext['evaluation']['notComputed']>[number];

/** Whether a not-computed entry is critical for lifting safety, and why (the message and the docs say the same). */
export interface NotComputedClass {
  /** The entry's subject, or a prefix of it ending at a dot */
  readonly subject: string;
  /** True when a missing figure can hide a way the load is released (blocks on lifting duty) */
  readonly critical: (design: Design, entry: Entry) => boolean;
  /** What the figure checks, for "not computed: give X to check Y" */
  readonly checks: string;
}

const always = () => true;
const never = () => false;

/**
 * The classes of not-computed entries, most specific subject first. A subject not listed is critical (the safe side).
 * Critical: the nut body and flange, the worn thread and the nut's yield on the load path, fatigue of the load-carrying
 * threads, the dynamic factor of the strength proof, whether a brake can stop a descending load, the static rating of a
 * rolling thrust bearing in the load path, and the heat of a nut whose material has a temperature limit (a plastic nut
 * softens and strips). Not critical: the wear life (the worn-thread check bounds the wear), the heat of a metal nut (a
 * lubrication and wear matter; the pV check bounds the rubbing heat), a plastic nut's pV at temperature (wear), the safety
 * nut where the worn-thread check stands (its own entry blocks when neither is given), a plain collar's pressure (it galls
 * and raises the torque the drive check holds, it does not release the load), a rolling bearing's dynamic rating and
 * rolling element (its life), and the brake's response time and the motor inertia (the stopping distance; whether the
 * brake stops does not depend on them).
 */
export const NOT_COMPUTED_CLASSES: readonly NotComputedClass[] = [
  { subject: 'nutBody', critical: always, checks: 'the nut body and flange strength' },
  { subject: 'safetyNut.strippingNutFactor', critical: always, checks: "the safety nut's thread stripping" },
  { subject: 'safetyNut', critical: never, checks: 'a second load path (a safety nut); the worn-thread check stands in for it' },
  { subject: 'wornThread', critical: always, checks: "the worn nut thread's stripping" },
  { subject: 'dynamics.dynamicFactor', critical: always, checks: 'the dynamic factor of the lifting strength checks' },
  { subject: 'operation.meanPowerLoss', critical: (d) => d.nut.maxTemperature != null, checks: 'the heat of friction against the duty (nut temperature)' },
  { subject: 'thermal', critical: (d) => d.nut.maxTemperature != null, checks: "the nut's temperature against its limit" },
  { subject: 'wear.pvAtTemperature', critical: never, checks: "a plastic nut's pV at its working temperature" },
  { subject: 'wearLife', critical: never, checks: 'the wear life' },
  { subject: 'stopping.responseTime', critical: never, checks: 'the stopping distance during the brake response' },
  { subject: 'stopping.inertia', critical: never, checks: "the stopping distance with the motor's inertia" },
  { subject: 'stopping', critical: always, checks: 'whether the brake stops a descending load' },
  { subject: 'fatigue', critical: always, checks: 'fatigue of the screw root and nut threads' },
  { subject: 'collarBearing.bearingPressure', critical: never, checks: 'the plain collar bearing pressure' },
  { subject: 'collarBearing.pressureRatio', critical: never, checks: 'the plain collar bearing pressure against its allowable' },
  { subject: 'collarBearing.rollingElement', critical: never, checks: "the thrust bearing's life exponent" },
  { subject: 'collarBearing', critical: (_d, e) => e.missing.some((m) => m.includes('staticRating')), checks: "the thrust bearing's static safety and life" },
];

/** The class of an entry: the first whose subject is the entry's subject or a dotted prefix of it; null when none is listed. */
export function notComputedClassOf(subject: string): NotComputedClass | null {
  return NOT_COMPUTED_CLASSES.find((c) => subject === c.subject || subject.startsWith(`${c.subject}.`)) ?? null;
}

/** Whether an entry blocks on lifting duty: a subject without a class is critical (the safe side). */
export function criticalOnLifting(design: Design, entry: Entry): boolean {
  const c = notComputedClassOf(entry.subject);
  return c === null ? true : c.critical(design, entry);
}

export function engineNotComputed({ design, evaluation, thresholds }: RuleContext): Finding | null {
  const severityOnLifting = thresholds.notComputed?.onLifting;
  if (severityOnLifting === undefined) return null;
  // Read with `?? []`: an evaluation stored by an engine before 1.2 has no list (its missing groups are read by the rules that need them)
  const entries = evaluation.notComputed ?? [];
  if (entries.length === 0) return null;
  const lifting = design.duty.kind === 'lifting';
  const blocks = lifting && severityOnLifting === 'blocking';
  const blocking = blocks ? entries.filter((e) => criticalOnLifting(design, e)) : [];
  const information = entries.filter((e) => !blocking.includes(e));
  const named = (e: Entry) => `${e.subject} (give ${e.missing.join('; ')}): ${e.reason}`;
  const noted = (e: Entry) => `not computed: give ${e.missing.join('; ')} to check ${notComputedClassOf(e.subject)?.checks ?? e.subject} (${e.subject})`;
  const parts: string[] = [];
  if (blocking.length > 0) {
    parts.push(
      `${blocking.length} ${blocking.length === 1 ? 'check' : 'checks'} critical for lifting safety could not be computed for want of a value: ` +
        `${blocking.map(named).join(' · ')}. On lifting duty such a check blocks; give the values named to make ${blocking.length === 1 ? 'it' : 'them'}.`,
    );
  }
  if (information.length > 0) parts.push(`${information.map(noted).join(' · ')}.`);
  return finding(
    { ruleId: ENGINE_NOT_COMPUTED_ID, unit: null, basis: BASIS },
    {
      severity: blocking.length > 0 ? 'blocking' : 'info',
      measured: entries.length,
      limit: 0,
      subject: (blocking[0] ?? entries[0]).subject,
      message: parts.join(' '),
    },
  );
}

export const engineNotComputedRule: Rule = {
  id: ENGINE_NOT_COMPUTED_ID,
  title: 'Checks not computed',
  basis: BASIS,
  description:
    'Lists every figure the engine could not compute with the inputs it lacks. Where notComputed.onLifting is "blocking", an ' +
    'entry critical for lifting safety (nut body, worn thread, fatigue, dynamic factor, brake stopping, a thrust bearing\'s ' +
    'static rating, the heat of a nut with a temperature limit) blocks on lifting duty; every other entry, and every entry ' +
    'on other duties, is information. Only in rule sets with the notComputed group (2026.12-3 on).',
  check: engineNotComputed,
};
