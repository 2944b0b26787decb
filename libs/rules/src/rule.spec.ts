/**
 * finding(): a wiring helper, checked against the object spread it replaces (no engineering value is computed here).
 */
import { finding } from './rule';

describe('finding()', () => {
  it('gives the same keys, order and values as { ...base, ...fields }, a field overriding the base in place', () => {
    const base = { ruleId: 'nut-pv', unit: 'Pa*m/s', subject: 'wear.pv', basis: 'common practice' } as const;
    const fields = { severity: 'warning', measured: 1.5, limit: null, subject: 'design.nut.allowablePv', message: 'm' } as const;
    const built = finding(base, fields);
    expect(JSON.stringify(built)).toBe(JSON.stringify({ ...base, ...fields }));
    expect(Object.keys(built)).toEqual(['ruleId', 'unit', 'subject', 'basis', 'severity', 'measured', 'limit', 'message']);
    expect(built.subject).toBe('design.nut.allowablePv');
  });

  it('returns a new object each time and leaves the base untouched', () => {
    const base = { ruleId: 'r', unit: '-', subject: 's', basis: 'b' };
    const a = finding(base, { severity: 'info', measured: 1, limit: 2, message: 'a' });
    const b = finding(base, { severity: 'blocking', measured: 3, limit: 2, message: 'b' });
    expect(a).not.toBe(b);
    expect(a.severity).toBe('info');
    expect(base).toEqual({ ruleId: 'r', unit: '-', subject: 's', basis: 'b' });
  });
});
