/**
 * Every figure the engine could not compute (Evaluation.notComputed, engine 1.2), named with the inputs that would let it
 * be computed: blocking on lifting duty under rule sets that say so, information otherwise; never a silent pass.
 */
import type { Finding } from '@leadline/contracts';
import { finding, type Rule, type RuleContext } from '../rule';

export const ENGINE_NOT_COMPUTED_ID = 'engine-not-computed';
const BASIS =
  'common practice on the safe side: a check of lifting equipment that cannot be made is treated as failed until the missing ' +
  'value is given (docs/rules.md); the wear life is information only, for want of a design-life input';

/** Subjects that are information only whatever the duty: no rule holds them against a limit yet. */
const INFORMATION_ONLY = /^wearLife(\.|$)/;

export function engineNotComputed({ design, evaluation, thresholds }: RuleContext): Finding | null {
  const severityOnLifting = thresholds.notComputed?.onLifting;
  if (severityOnLifting === undefined) return null;
  // Read with `?? []`: an evaluation stored by an engine before 1.2 has no list (its missing groups are read by the rules that need them)
  const entries = evaluation.notComputed ?? [];
  if (entries.length === 0) return null;
  const lifting = design.duty.kind === 'lifting';
  const blockingEntries = lifting && severityOnLifting === 'blocking' ? entries.filter((e) => !INFORMATION_ONLY.test(e.subject)) : [];
  const listed = entries.map((e) => `${e.subject} (give ${e.missing.join('; ')}): ${e.reason}`).join(' · ');
  return finding(
    { ruleId: ENGINE_NOT_COMPUTED_ID, unit: null, basis: BASIS },
    {
      severity: blockingEntries.length > 0 ? 'blocking' : 'info',
      measured: entries.length,
      limit: 0,
      subject: (blockingEntries[0] ?? entries[0]).subject,
      message:
        `${entries.length} ${entries.length === 1 ? 'check was' : 'checks were'} not computed for want of a value: ${listed}.` +
        (blockingEntries.length > 0
          ? ` On lifting duty a check that cannot be made blocks; give the values named to make ${blockingEntries.length === 1 ? 'it' : 'them'}.`
          : ''),
    },
  );
}

export const engineNotComputedRule: Rule = {
  id: ENGINE_NOT_COMPUTED_ID,
  title: 'Checks not computed',
  basis: BASIS,
  description:
    'Lists every figure the engine could not compute with the inputs it lacks; blocks on lifting duty where notComputed.onLifting ' +
    'is "blocking" (the wear life stays information), information otherwise. Only in rule sets with the notComputed group (2026.12-3 on).',
  check: engineNotComputed,
};
