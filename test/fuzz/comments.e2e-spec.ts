/** HTTP fuzz of POST /api/v1/revisions/:id/comments (test/fuzz/fuzz-support.ts): 700 inputs in the default run. */
import fc from 'fast-check';
import { changedDesign, clearDesign } from '../support/designs';
import { SEED } from '../support/property';
import { fuzz, FUZZ_TIMEOUT_MS, mutate, mutations, startFuzzTarget, type FuzzTarget, type Json } from './fuzz-support';

let target: FuzzTarget;
// the comment rate limits are tested in test/reports/report-limits.e2e-spec.ts; here every input must reach validation
beforeAll(async () => (target = await startFuzzTarget('FZ-C', { LEADLINE_COMMENTS_PER_REVISION_PER_MINUTE: '100000', LEADLINE_COMMENTS_PER_USER_PER_MINUTE: '100000' })));
afterAll(() => target?.close());

it(`comments: no 5xx, every rejection names a field, no row written [POST /api/v1/revisions/:id/comments] (seed ${SEED})`, async () => {
  const opened = await target.t.call('POST', `/api/v1/calculations/${target.calculationId}/revisions`, { design: changedDesign(clearDesign, 'to be commented'), note: 'to be commented' });
  expect(opened.status).toBe(201);
  target.forget();
  const bases: Json[] = [{ text: 'why bronze?' }, { text: 'check the pitch', target: { field: 'thread.size' } }, { text: 'on the speed', target: { field: 'design.duty.speed' } }];
  await fuzz(
    target,
    fc.asyncProperty(fc.nat({ max: bases.length - 1 }), mutations, fc.boolean(), async (b, ops, asReviewer) => {
      await target.check('POST', `/api/v1/revisions/${opened.body.revisionId}/comments`, mutate(bases[b], ops), { as: asReviewer ? 'reviewer' : 'author' });
    }) as never,
    700,
  );
}, FUZZ_TIMEOUT_MS);
