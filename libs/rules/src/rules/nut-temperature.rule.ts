/** The nut's estimated steady temperature against its material's service limit (plastic nuts above all). */
import type { CheckDeclaration } from '../check';
import type { RuleContext } from '../rule';
import { limitRule } from './limit-rule';

export const NUT_TEMPERATURE_ID = 'nut-temperature';
const BASIS =
  "common practice: the nut's steady temperature stays below its material's service limit by the rule set's margin (default 0 K); " +
  "heat balance by Newton's law of cooling (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Eq. (1.3a), from memory)";

/**
 * The temperature rise as a fraction of the rise allowed, dT / (T_max - margin - T_ambient): at most 1. A limit at or below
 * the ambient allows no rise (an unbounded fraction, which fails).
 */
function riseFraction({ evaluation, thresholds }: RuleContext): number | null {
  const t = evaluation.thermal ?? null;
  if (t === null || t.maxTemperature === null) return null;
  const allowed = t.maxTemperature - (thresholds.nutTemperature?.minTemperatureMargin ?? 0) - t.ambientTemperature;
  return allowed > 0 ? t.temperatureRise / allowed : Number.POSITIVE_INFINITY;
}

export const NUT_TEMPERATURE_CHECK: CheckDeclaration = {
  id: NUT_TEMPERATURE_ID,
  ruleId: NUT_TEMPERATURE_ID,
  label: 'Nut temperature rise, share of the rise allowed',
  shortLabel: 'Nut temperature',
  group: 'heat',
  quantity: 'fraction',
  limitKind: 'maximum',
  subject: () => 'thermal.temperatureRise',
  applies: ({ design, thresholds }) => thresholds.nutTemperature !== undefined && design.nut.maxTemperature != null,
  value: riseFraction,
  limit: () => 1,
  // Without a heat estimate the engine lists what is missing (the engine-not-computed rule speaks)
  missing: () => 'info',
};

export const nutTemperatureRule = limitRule({
  id: NUT_TEMPERATURE_ID,
  title: 'Nut temperature',
  basis: BASIS,
  description:
    "With a nut service-temperature limit: blocks when the estimated steady nut temperature (ambient plus the rise from the mean " +
    'friction power) comes closer to the limit than nutTemperature.minTemperatureMargin. Only in rule sets with the ' +
    'nutTemperature group (2026.12-3 on).',
  check: NUT_TEMPERATURE_CHECK,
  what: 'Nut temperature rise (share of the rise to the material limit)',
  missing: () => 'duty.speed or duty.linearSpeed, duty.dutyCycle or duty.stroke with duty.cyclesPerHour, and nut.outsideDiameter',
  consequence: 'Above its service temperature a plastic nut softens, creeps and wears fast.',
  remedy: 'Reduce the duty (cycles per hour or duty cycle), the speed or the friction, enlarge the nut, or choose a nut material rated for a higher temperature.',
});
