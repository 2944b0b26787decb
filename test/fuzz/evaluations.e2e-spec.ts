/** HTTP fuzz of POST /api/v1/evaluations (test/fuzz/fuzz-support.ts): 2,600 inputs in the default run. */
import fc from 'fast-check';
import { evaluationResponseSchema } from '@leadline/contracts';
import { clearDesign } from '../support/designs';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget } from './fuzz-support';

let target: FuzzTarget;
beforeAll(async () => (target = await startFuzzTarget('FZ-E')));
afterAll(() => target?.close());

it(`evaluations: no 5xx, every rejection names a field, no row written; a 2xx matches its schema [POST /api/v1/evaluations] (seed ${SEED})`, async () => {
  await fuzz(
    target,
    fc.asyncProperty(mutations, fc.boolean(), async (ops, trace) => {
      const res = await target.check('POST', `/api/v1/evaluations${trace ? '?trace=true' : ''}`, mutate(clearDesign, ops));
      if (res.status === 200) {
        // a non-finite value would come out as null, outside the schema
        const { trace: _trace, ...evaluation } = res.body;
        const parsed = evaluationResponseSchema.omit({ trace: true }).safeParse(evaluation);
        if (!parsed.success) throw new Error(`200 evaluation outside its schema: ${JSON.stringify(parsed.error.issues.slice(0, 3))}`);
      }
    }) as never,
    2600,
  );
}, FUZZ_TIMEOUT_MS);
