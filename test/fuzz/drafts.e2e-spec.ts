/** HTTP fuzz of PUT /api/v1/calculations/:id/draft (test/fuzz/fuzz-support.ts): 600 inputs in the default run. */
import fc from 'fast-check';
import { clearDesign } from '../support/designs';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget, type Json } from './fuzz-support';

let target: FuzzTarget;
beforeAll(async () => (target = await startFuzzTarget('FZ-D')));
afterAll(() => target?.close());

it(`drafts: no 5xx, every rejection names a field, no row written [PUT /api/v1/calculations/:id/draft] (seed ${SEED})`, async () => {
  let accepted = 0;
  await fuzz(
    target,
    fc.asyncProperty(mutations, fc.boolean(), async (ops, withNote) => {
      const body: Json = withNote ? { design: clearDesign, note: 'a draft being fuzzed' } : { design: clearDesign };
      const res = await target.check('PUT', `/api/v1/calculations/${target.calculationId}/draft`, mutate(body, ops));
      if (res.status < 300) accepted++;
    }) as never,
    600,
  );
  // a mutation that keeps the design valid is stored as the author's draft, and the newest one reads back
  const back = await target.t.call('GET', `/api/v1/calculations/${target.calculationId}/draft`);
  expect(back.status).toBe(accepted > 0 ? 200 : 404);
}, FUZZ_TIMEOUT_MS);
