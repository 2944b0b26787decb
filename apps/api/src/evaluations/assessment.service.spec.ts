/**
 * The assessment's second line of defence: when the engine still produces a figure that is not
 * finite (the contract's plausible ranges should prevent it), the design is refused with 422 and never judged
 * "clear". A wiring test: the engine is replaced by one that returns a real evaluation with one figure overflowed.
 */
import * as mechanics from '@leadline/mechanics';
import { RULE_SET_2026_12_2 } from '@leadline/rules';
import { clearDesign } from '../../../../test/support/designs';
import { ValidationProblem } from '../infra/http/problem';
import { AssessmentService } from './assessment.service';
import { nonFiniteFigure } from './assess-design';

jest.mock('@leadline/mechanics', () => {
  const actual = jest.requireActual('@leadline/mechanics');
  return { ...actual, evaluate: jest.fn(actual.evaluate) };
});
const evaluateMock = mechanics.evaluate as jest.MockedFunction<typeof mechanics.evaluate>;
const realEvaluate = jest.requireActual('@leadline/mechanics').evaluate as typeof mechanics.evaluate;

afterEach(() => evaluateMock.mockImplementation(realEvaluate));

describe('AssessmentService: a figure that is not finite is never judged', () => {
  const service = new AssessmentService();

  it('the clear design is assessed clear with every figure finite (the real engine)', () => {
    const a = service.assess(clearDesign, RULE_SET_2026_12_2);
    expect(a.verdict).toBe('clear');
    expect(nonFiniteFigure(a.evaluation, 'evaluation')).toBeNull();
  });

  it.each([
    ['Infinity', Infinity],
    ['NaN', NaN],
  ])('a von Mises stress of %s is refused with 422 naming (body) and the figure', (_name, bad) => {
    evaluateMock.mockImplementation((design) => {
      const e = realEvaluate(design);
      return { ...e, stresses: { ...e.stresses, body: { ...e.stresses.body, vonMises: bad } } };
    });
    let thrown: unknown;
    try {
      service.assess(clearDesign, RULE_SET_2026_12_2);
    } catch (err) {
      thrown = err;
    }
    expect(thrown).toBeInstanceOf(ValidationProblem);
    const problem = thrown as ValidationProblem;
    expect(problem.status).toBe(422);
    expect(problem.errors).toEqual([{ path: '(body)', message: expect.stringContaining('evaluation.stresses.body.vonMises is not a finite number') }]);
  });

  it('nested under a submission, the path names the design', () => {
    evaluateMock.mockImplementation((design) => {
      const e = realEvaluate(design);
      return { ...e, stresses: { ...e.stresses, body: { ...e.stresses.body, vonMises: Infinity } } };
    });
    expect(() => service.assess(clearDesign, RULE_SET_2026_12_2, 'design.')).toThrow(ValidationProblem);
    try {
      service.assess(clearDesign, RULE_SET_2026_12_2, 'design.');
    } catch (err) {
      expect((err as ValidationProblem).errors[0].path).toBe('design');
    }
  });

  it('nonFiniteFigure finds the first non-finite number in nested objects and arrays', () => {
    expect(nonFiniteFigure({ a: 1, b: [2, { c: -Infinity }] }, 'x')).toBe('x.b.1.c');
    expect(nonFiniteFigure({ a: 1, b: [2, { c: null, d: 'text' }] }, 'x')).toBeNull();
  });

  it('nonFiniteFigure finds a non-finite formula input in the trace, and walks a trace entry of another shape', () => {
    const trace = { 'torque.raise': { formula: 'raise-torque', inputs: { F: 1, d_m: Number.NaN } } };
    expect(nonFiniteFigure({ torque: { raise: 2 }, trace }, 'evaluation')).toBe('evaluation.trace.torque.raise.inputs.d_m');
    expect(nonFiniteFigure({ trace: { 'a.b': { formula: 'f', inputs: { x: 1 } } } }, 'e')).toBeNull();
    expect(nonFiniteFigure({ trace: { odd: { inputs: { x: 1 }, extra: [Infinity] } } }, 'e')).toBe('e.trace.odd.extra.0');
    expect(nonFiniteFigure({ trace: { nested: { formula: 'f', inputs: { x: { y: -Infinity } } } } }, 'e')).toBe('e.trace.nested.inputs.x.y');
  });
});
