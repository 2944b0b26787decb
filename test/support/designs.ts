/** Test designs built from the invented fixture (test/fixtures/ok), each changed in one respect. */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

/** The README example jack as entered (test/fixtures/ok): the corrected thread checks of engine 1.1 flag it. */
export const readmeJack = JSON.parse(readFileSync(join(__dirname, '../fixtures/ok/trapezoidal-jack.json'), 'utf8'));

/**
 * The same jack made clear under rule set 2026.12-3 (the default): an aluminium-bronze nut (ASTM B148 C95400, 30 ksi
 * minimum; the tin-bronze nut's own threads reach only 2.98 of the lifting factor 3), turned at 20 rpm (2.3 m/min: the
 * screw-jack class of Shigley Table 8-4) and a stated brake torque of 60 N*m (2 x F l / (2 pi) = 40 N*m needed); with the
 * inputs of the lifting checks critical for safety: the nut's outside diameter (nut body), a safety nut whose gap is the
 * wear allowed (worn thread), the load cycles (fatigue) and the nut's fatigue strength, and a 4140 Q&T screw (on the
 * 1045 cold-drawn screw the thread-root Goodman factor is 1.43, below the 1.5 of rule set 2026.12-3). Invented values;
 * the nut's fatigue strength 150 MPa is an invented, cautious figure for C95400 (give the supplier's value at the design
 * cycles in a real design). The wear life, heat and stopping distance stay "not computed" (information).
 */
export const clearDesign = {
  ...readmeJack,
  nut: { ...readmeJack.nut, material: 'aluminum-bronze', outsideDiameter: '65 mm', safetyNut: { length: '30 mm', gap: '1.5 mm' }, fatigueStrength: '150 MPa' },
  screw: { ...readmeJack.screw, material: 'steel-4140-qt650' },
  duty: { ...readmeJack.duty, speed: '20 rpm', brakeTorque: '60 N*m', cycles: 20000 },
};

/** Same jack, but the thread friction is only an assumption: one warning (friction-source-assumed). */
export const warningDesign = {
  ...clearDesign,
  friction: { ...clearDesign.friction, thread: { ...clearDesign.friction.thread, source: { kind: 'assumed', reference: 'estimate pending a friction test' } } },
};

/** Same jack with a three-start thread and no brake on lifting duty: it does not self-lock, so it blocks. */
export const blockedDesign = {
  ...clearDesign,
  thread: { form: 'trapezoidal', majorDiameter: '40 mm', pitch: '7 mm', starts: 3 },
  duty: { ...readmeJack.duty, speed: '20 rpm', brake: false, cycles: 20000 }, // no brake, so no brake torque
};

/** The blocked design on positioning duty: not self-locking is only information there. */
export const positioningDesign = { ...blockedDesign, duty: { ...blockedDesign.duty, kind: 'positioning' } };

/**
 * The design with its thread friction's reference told apart by `label`: a changed design with the same figures and
 * verdict, for tests that submit several revisions (a submission equal to the previous revision is refused with 409).
 */
export function changedDesign<T extends { friction: { thread: unknown } }>(design: T, label: string | number): T {
  const thread = design.friction.thread as { source: { kind: string; reference: string } };
  return {
    ...design,
    friction: { ...design.friction, thread: { ...thread, source: { ...thread.source, reference: `${thread.source.reference} (${label})` } } },
  };
}
