/** Test designs built from the invented fixture (test/fixtures/ok), each changed in one respect. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

export const clearDesign = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));

/** Same jack, but the thread friction is only an assumption: one warning (friction-source-assumed). */
export const warningDesign = {
  ...clearDesign,
  friction: { ...clearDesign.friction, thread: { ...clearDesign.friction.thread, source: { kind: 'assumed', reference: 'estimate pending a friction test' } } },
};

/** Same jack with a three-start thread and no brake on lifting duty: it does not self-lock, so it blocks. */
export const blockedDesign = {
  ...clearDesign,
  thread: { form: 'trapezoidal', majorDiameter: '40 mm', pitch: '7 mm', starts: 3 },
  duty: { ...clearDesign.duty, brake: false },
};

/** The blocked design on positioning duty: not self-locking is only information there. */
export const positioningDesign = { ...blockedDesign, duty: { ...blockedDesign.duty, kind: 'positioning' } };
