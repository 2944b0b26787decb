/** HTTP fuzz of the two submission routes (test/fuzz/fuzz-support.ts): 1,200 inputs in the default run. */
import fc from 'fast-check';
import { clearDesign } from '../support/designs';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget } from './fuzz-support';

let target: FuzzTarget;
beforeAll(async () => (target = await startFuzzTarget('FZ-S')));
afterAll(() => target?.close());

it(`submissions: no 5xx, every rejection names a field, no row written [POST /api/v1/products/:id/calculations, POST /api/v1/calculations/:id/revisions] (seed ${SEED})`, async () => {
  let n = 0;
  await fuzz(
    target,
    fc.asyncProperty(mutations, fc.boolean(), fc.boolean(), async (ops, openNew, withKey) => {
      const headers = withKey ? { 'idempotency-key': `fz-${++n}-${SEED}` } : undefined;
      if (openNew) {
        await target.check('POST', `/api/v1/products/${target.productId}/calculations`, mutate({ title: 'fuzzed calculation', design: clearDesign }, ops), { headers });
      } else {
        await target.check('POST', `/api/v1/calculations/${target.calculationId}/revisions`, mutate({ design: clearDesign, note: 'fuzzed revision' }, ops), { headers });
      }
    }) as never,
    1200,
  );
}, FUZZ_TIMEOUT_MS);
