/**
 * The evaluation route's answer (evaluations.controller.ts): over generated designs of every form and duty, with and
 * without the trace, the JSON it writes holds every figure of the evaluation, the trace exactly when asked, and the
 * declared checks, the governing check, the verdict and the rule set (a property of the wiring; the figures are the
 * engine's and are tested against published sources in libs/mechanics).
 */
import { parseDesign } from '@leadline/contracts';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import fc from 'fast-check';
import { designInputArbitrary } from '../../../../libs/rules/src/testing/arbitrary';
import { checkProperty } from '../../../../test/support/property';
import { AssessmentService } from './assessment.service';
import { evaluationAnswer, writeEvaluationAnswer } from './evaluation-answer';

const assessor = new AssessmentService();

describe('the evaluation answer', () => {
  it('writes the whole evaluation (its trace only when asked) with checks, governing, verdict and rule set, over 240 generated designs', () => {
    let written = 0;
    checkProperty(
      fc.property(designInputArbitrary, fc.boolean(), (input, withTrace) => {
        if (!parseDesign(input).success) return; // the generator's rare out-of-range combination
        const assessment = assessor.assess(input, DEFAULT_RULE_SET);
        const back = JSON.parse(writeEvaluationAnswer(evaluationAnswer(assessment, withTrace)));
        const { trace, ...figures } = JSON.parse(JSON.stringify(assessment.evaluation));
        expect(back).toEqual({
          ...figures,
          ...(withTrace ? { trace } : {}),
          checks: JSON.parse(JSON.stringify(assessment.checks)),
          governing: JSON.parse(JSON.stringify(assessment.governing)),
          verdict: assessment.verdict,
          ruleSetVersion: DEFAULT_RULE_SET.version,
        });
        written++;
      }),
      { numRuns: 240 },
    );
    expect(written).toBeGreaterThan(200);
  });
});
