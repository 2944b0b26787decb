/** HTTP fuzz of POST /api/v1/revisions/:id/decisions (test/fuzz/fuzz-support.ts): 700 inputs in the default run. */
import fc from 'fast-check';
import { changedDesign, clearDesign } from '../support/designs';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget, type Json } from './fuzz-support';

let target: FuzzTarget;
beforeAll(async () => (target = await startFuzzTarget('FZ-D')));
afterAll(() => target?.close());

it(`decisions: no 5xx, every rejection names a field, no row written [POST /api/v1/revisions/:id/decisions] (seed ${SEED})`, async () => {
  let freshCount = 0;
  const fresh = async () => {
    target.forget();
    const res = await target.t.call('POST', `/api/v1/calculations/${target.calculationId}/revisions`, { design: changedDesign(clearDesign, ++freshCount), note: 'awaiting a fuzzed decision' });
    expect(res.status).toBe(201);
    return res.body.revisionId as string;
  };
  let revision = await fresh();
  const bases: Json[] = [
    { decision: 'approve' },
    { decision: 'reject', comment: 'the collar friction needs a test report' },
    { decision: 'approve', comment: 'checked', acknowledgements: [], comments: [{ text: 'see the nut length', target: { field: 'nut.length' } }] },
  ];
  await fuzz(
    target,
    fc.asyncProperty(fc.nat({ max: bases.length - 1 }), mutations, async (b, ops) => {
      const res = await target.check('POST', `/api/v1/revisions/${revision}/decisions`, mutate(bases[b], ops), { as: 'reviewer' });
      if (res.status === 201) revision = await fresh(); // decided: the next input goes to a revision awaiting review
    }) as never,
    700,
  );
}, FUZZ_TIMEOUT_MS);
