/**
 * Section 5 of the report, checks against the limits of the rule set (from the rules' declared checks), section 5.1 (the measured values the findings record) and section 6, the findings.
 */
import type { Finding, ProductEvent, Severity } from '@leadline/contracts';
import { CHECK_STATUSES, formatQuantity, sig, wordFor, type QuantityKind, type UnitSystem } from '@leadline/presentation';
import { type Check } from '@leadline/rules';
import type { CheckRow, FindingGroup, SafetyFactorRow } from '../report-view';
import { pathLabel } from './calculation';
import { actorName } from './review';

// ---------------------------------------------------------------------------------------------------------
// Safety factors, checks and findings


/** The factor table: every check the rules declare and apply to this revision (libs/rules check declarations). */
export function buildSafetyFactors(checks: readonly Check[], system: UnitSystem): SafetyFactorRow[] {
  return checks.map((c) => {
    const status: SafetyFactorRow['status'] = c.status === 'pass' ? 'meets' : c.status === 'fail' ? 'below' : c.status;
    const kind: QuantityKind = c.quantity === 'fraction' ? 'percent' : 'ratio';
    const missing = c.value === null;
    return {
      key: c.id,
      label: c.label,
      shortLabel: c.shortLabel,
      path: c.subject,
      value: c.value,
      limit: c.limit,
      limitKind: c.limitKind,
      valueText: missing ? '—' : formatQuantity(c.value as number, kind, system),
      limitText: `${c.limitKind === 'minimum' ? '≥' : '≤'} ${formatQuantity(c.limit, kind, system)}`,
      status,
      statusText: missing && c.status === 'fail'
        ? 'not computed: a value is missing (blocking)'
        : c.note !== null ? `${wordFor(CHECK_STATUSES, 'fail')}: ${c.note}` : wordFor(CHECK_STATUSES, c.status),
      limitFrom: c.ruleId,
      governing: false,
    };
  });
}

export function buildChecks(findings: readonly Finding[], system: UnitSystem): CheckRow[] {
  return findings
    .filter((f) => f.measured !== null || f.limit !== null)
    .map((f) => ({
      ruleId: f.ruleId,
      severity: f.severity,
      subject: f.subject === null ? '—' : pathLabel(f.subject),
      measured: findingValue(f.measured, f.unit, f.subject, system),
      limit: findingValue(f.limit, f.unit, f.subject, system),
      ratio: typeof f.measured === 'number' && typeof f.limit === 'number' && f.limit !== 0 ? sig(f.measured / f.limit) : '—',
    }));
}

/** Acknowledgements carried by review events: data.acknowledgements as { finding, comment } (or rule ids / { ruleId }). */
export function acknowledgements(events: readonly ProductEvent[]): Map<string, string> {
  const acks = new Map<string, string>();
  for (const ev of events) {
    // The decision event as the review workflow writes it: acknowledgements [{ finding: ruleId, comment }]
    const list = ev.data.acknowledgements as readonly { finding: string; comment: string }[] | undefined;
    if (!Array.isArray(list)) continue;
    for (const { finding, comment } of list) acks.set(finding, `${actorName(ev.actor)}: ${comment}`);
  }
  return acks;
}

export function buildFindingGroups(findings: readonly Finding[], events: readonly ProductEvent[], system: UnitSystem): FindingGroup[] {
  const acks = acknowledgements(events);
  return SEVERITY_GROUPS.map((g) => ({
    ...g,
    findings: findings
      .filter((f) => f.severity === g.severity)
      .map((f) => ({
        ruleId: f.ruleId,
        severity: f.severity,
        message: f.message,
        basis: f.basis,
        subject: f.subject === null ? null : `${pathLabel(f.subject)} (${f.subject})`,
        measured: findingValue(f.measured, f.unit, f.subject, system),
        limit: findingValue(f.limit, f.unit, f.subject, system),
        acknowledgedBy: acks.get(f.ruleId) ?? null,
      })),
  }));
}

export const SEVERITY_GROUPS: readonly { severity: Severity; title: string; explanation: string }[] = [
  { severity: 'blocking', title: 'Blocking findings', explanation: 'Must be resolved by a new revision; a blocked revision cannot be approved.' },
  { severity: 'warning', title: 'Warnings', explanation: 'Each must be acknowledged by the reviewer, with a reason, before approval.' },
  { severity: 'info', title: 'Information', explanation: 'Recorded for the reader; no action required.' },
];

/** Kind of a finding's measured/limit from its unit (and subject, to tell pressure from stress). */
export function findingKind(unit: string | null, subject: string | null): QuantityKind | null {
  const u = (unit ?? '').replace(/\s/g, '').replace('·', '*');
  if (u === '' || u === '-') return 'ratio';
  if (u === 'Pa') return subject?.startsWith('wear.') ? 'pressure' : 'stress';
  if (u === 'N*m' || u === 'Nm') return 'torque';
  if (u === 'N') return 'force';
  if (u === 'm') return 'length';
  if (u === 'rpm' || u === 'rev/min') return 'rpm';
  if (u === 'm/s') return subject?.startsWith('wear.') ? 'slidingSpeed' : 'travelSpeed';
  if (u === 'Pa*m/s') return 'pv';
  if (u === 'W') return 'power';
  if (u === 'deg' || u === '°') return 'angle';
  return null;
}

export function findingValue(value: Finding['measured'], unit: string | null, subject: string | null, system: UnitSystem): string {
  if (value === null) return '—';
  if (typeof value === 'boolean') return value ? 'yes' : 'no';
  if (typeof value === 'string') return value;
  const kind = findingKind(unit, subject);
  if (kind === null) return `${sig(value)} ${unit ?? ''}`.trim();
  return formatQuantity(value, kind, system);
}

