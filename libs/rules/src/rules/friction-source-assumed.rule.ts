/** Friction coefficients that were assumed rather than taken from a handbook, a test or a supplier. */
import type { Finding } from '@leadline/contracts';
import type { Rule, RuleContext } from '../rule';

export const FRICTION_SOURCE_ASSUMED_ID = 'friction-source-assumed';
const BASIS =
  'common practice: friction drives the self-locking and torque checks, so it needs a traceable source; ' +
  "handbook ranges e.g. Shigley 9th ed. Tables 8-5 and 8-6";

export function frictionSourceAssumed({ design }: RuleContext): Finding | null {
  const { thread, collar } = design.friction;
  const assumed = [
    thread.source.kind === 'assumed' ? 'thread' : null,
    collar !== null && collar.source.kind === 'assumed' ? 'collar' : null,
  ].filter((s): s is string => s !== null);
  if (assumed.length === 0) return null;
  const which = assumed.join(' and ');
  return {
    ruleId: FRICTION_SOURCE_ASSUMED_ID,
    severity: 'warning',
    measured: 'assumed',
    limit: 'handbook, test or supplier',
    unit: null,
    subject: assumed[0] === 'thread' ? 'design.friction.thread.source' : 'design.friction.collar.source',
    message:
      `The ${which} friction ${assumed.length > 1 ? 'coefficients are' : 'coefficient is'} assumed, not taken from a ` +
      `handbook, a test or the supplier. Self-locking is judged at the minimum and drive torque at the maximum friction, ` +
      `so an assumed range can hide a screw that back-drives or a drive that stalls. Use a friction-library entry ` +
      `(handbook range) or test data for the actual pair and lubricant.`,
    basis: BASIS,
  };
}

export const frictionSourceAssumedRule: Rule = {
  id: FRICTION_SOURCE_ASSUMED_ID,
  title: 'Assumed friction coefficients',
  basis: BASIS,
  description: "Warns when the thread or collar friction source kind is 'assumed'.",
  check: frictionSourceAssumed,
  nutIndependent: true,
};
