/**
 * The evaluation route writes its answer with a serializer compiled from the documented schema
 * (infra/http/response-serializer.ts): over generated designs of every form and duty, with and without the trace, the
 * JSON it writes is the same JSON value as JSON.stringify's (a property of the wiring; the figures are the engine's).
 */
import { parseDesign } from '@leadline/contracts';
import { DEFAULT_RULE_SET } from '@leadline/rules';
import fc from 'fast-check';
import { designInputArbitrary } from '../../../../libs/rules/src/testing/arbitrary';
import { checkProperty } from '../../../../test/support/property';
import { AssessmentService } from './assessment.service';
import { evaluationAnswer, writeEvaluationAnswer } from './evaluations.controller';

const assessor = new AssessmentService();

describe('the evaluation answer as written by the compiled serializer', () => {
  it('is the same JSON value as JSON.stringify gives, over 240 generated designs, trace or not', () => {
    let written = 0;
    checkProperty(
      fc.property(designInputArbitrary, fc.boolean(), (input, withTrace) => {
        if (!parseDesign(input).success) return; // the generator's rare out-of-range combination
        const answer = evaluationAnswer(assessor.assess(input, DEFAULT_RULE_SET), withTrace);
        expect(JSON.parse(writeEvaluationAnswer(answer))).toEqual(JSON.parse(JSON.stringify(answer)));
        written++;
      }),
      { numRuns: 240 },
    );
    expect(written).toBeGreaterThan(200);
  });

  it('still writes a field its schema does not list, at any depth (never a shorter answer)', () => {
    const input = JSON.parse(JSON.stringify(require('../../../../test/fixtures/ok/trapezoidal-jack.json')));
    const answer = evaluationAnswer(assessor.assess(input, DEFAULT_RULE_SET), false);
    const extended = { ...answer, notInSchema: { a: 1 }, geometry: { ...(answer.geometry as object), alsoNew: 'x' } };
    const back = JSON.parse(writeEvaluationAnswer(extended));
    expect(back.notInSchema).toEqual({ a: 1 });
    expect(back.geometry.alsoNew).toBe('x');
  });
});
