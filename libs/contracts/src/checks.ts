/**
 * The `checks` and `governing` of every evaluation answer (POST /api/v1/evaluations, a stored revision, a sizing
 * candidate): each numeric check the rules declare (libs/rules/src/check.ts), judged against the rule set's limit.
 */
import { z } from 'zod';

export const CHECK_STATUSES = ['pass', 'warning', 'fail', 'not-computed'] as const;

/** What a check is about, for grouping (libs/rules CheckGroup is this list). */
export const CHECK_GROUPS = ['holding', 'strength', 'column', 'speed', 'wear', 'drive', 'fatigue', 'bearing', 'heat'] as const;

export const checkSchema = z
  .object({
    id: z.string().describe('check id (the rule id where the rule makes one check)'),
    ruleId: z.string().describe('the rule that makes the check'),
    label: z.string().describe('what is checked, in words'),
    shortLabel: z.string(),
    group: z.enum(CHECK_GROUPS),
    quantity: z.enum(['factor', 'fraction']).describe('factor: a dimensionless factor or margin; fraction: a share of an allowable'),
    subject: z.string().describe('evaluation path of the value'),
    value: z.number().nullable().describe('null: not computed (see status)'),
    limit: z.number().describe('the limit of the rule set the design was judged by'),
    limitKind: z.enum(['minimum', 'maximum']),
    warnLimit: z.number().nullable().describe('warning level short of the limit, if the rule set has one'),
    ratio: z.number().nullable().describe('value / limit'),
    margin: z.number().nullable().describe('times the limit is met: value / limit for a minimum, limit / value for a maximum; below 1 falls short'),
    status: z.enum(CHECK_STATUSES),
    note: z.string().nullable().describe('why the check fails whatever its value, if it does'),
  })
  .describe('one numeric check of the rules');

export const governingSchema = checkSchema
  .nullable()
  .describe('the check furthest past its limit when any fails, else the one nearest to its limit; null when no check has a value');

export type CheckView = z.infer<typeof checkSchema>;
