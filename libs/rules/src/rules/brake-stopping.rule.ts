/** Whether the brake can bring a descending load to rest (thread and gearbox friction lost). */
import type { CheckDeclaration } from '../check';
import { limitRule } from './limit-rule';

export const BRAKE_STOPPING_ID = 'brake-stopping';
const BASIS =
  'common practice: a brake stops a descending load only if its torque at the screw exceeds the torque the load exerts with ' +
  'thread and gearbox friction lost, T_0 = F l / (2 pi) (Juvinall & Marshek 5th ed. Eq. (10.5)); constant deceleration ' +
  '(Meriam & Kraige, Dynamics, 7th ed., Sec. 5/2, from memory)';

export const BRAKE_STOPPING_CHECK: CheckDeclaration = {
  id: BRAKE_STOPPING_ID,
  ruleId: BRAKE_STOPPING_ID,
  label: 'Brake stopping, T_brake at the screw / T_0',
  shortLabel: 'Brake stopping',
  group: 'holding',
  quantity: 'factor',
  limitKind: 'minimum',
  strict: true,
  subject: () => 'stopping.stops',
  applies: ({ design, thresholds }) => thresholds.stopping?.mustStop === true && design.duty.brake && design.duty.brakeTorque != null,
  // Read with `?? null`: without a speed (or from an engine before 1.2) there is no stopping group
  value: ({ evaluation }) => {
    const s = evaluation.stopping ?? null;
    return s === null ? null : s.brakeTorqueAtScrew / s.loadTorque;
  },
  limit: () => 1,
  pastLimit: ({ design }) => (design.duty.kind === 'lifting' ? 'blocking' : 'warning'),
  // Without a speed the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const brakeStoppingRule = limitRule({
  id: BRAKE_STOPPING_ID,
  title: 'Brake stopping a descending load',
  basis: BASIS,
  description:
    'With a brake of stated torque and a speed: blocks on lifting duty (warns otherwise) when the brake torque at the screw does ' +
    'not exceed the zero-friction load torque, so the brake cannot stop the load. Only in rule sets with the stopping group (2026.12-3 on).',
  check: BRAKE_STOPPING_CHECK,
  what: 'Brake torque at the screw over the load torque with friction lost',
  missing: () => 'duty.speed or duty.linearSpeed',
  consequence: 'The brake cannot decelerate the descending load; it keeps running down.',
  remedy: 'Fit a stronger brake, put it ahead of a higher gear ratio, or reduce the lead.',
  nutIndependent: true,
});
