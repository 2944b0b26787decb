/**
 * Generated design inputs for property tests across thread forms, duties, materials, friction, brakes and drives
 * (thread sizes from the engine's standard tables; materials and friction from the engine libraries).
 */
import type { DesignInput } from '@leadline/contracts';
import { FRICTION_LIBRARY, NUT_MATERIALS, SCREW_MATERIALS } from '@leadline/mechanics';
import fc from 'fast-check';

/** Threads of several forms (pitch in mm, to size the nut): ISO trapezoidal, ASME Acme and Stub Acme, square, buttress, ISO metric. */
const SIZES: readonly { thread: DesignInput['thread']; pitch: number }[] = [
  { thread: { form: 'trapezoidal', size: 'Tr 16x4' }, pitch: 4 },
  { thread: { form: 'trapezoidal', size: 'Tr 24x5' }, pitch: 5 },
  { thread: { form: 'trapezoidal', size: 'Tr 40x7' }, pitch: 7 },
  { thread: { form: 'trapezoidal', size: 'Tr 60x9' }, pitch: 9 },
  { thread: { form: 'acme', size: '1-1/4-5 ACME' }, pitch: 25.4 / 5 },
  { thread: { form: 'acme', size: '2-4 ACME' }, pitch: 25.4 / 4 },
  { thread: { form: 'stub-acme', size: '1-5 STUB ACME' }, pitch: 25.4 / 5 },
  { thread: { form: 'square', majorDiameter: '32 mm', pitch: '4 mm' }, pitch: 4 },
  { thread: { form: 'buttress', majorDiameter: '40 mm', pitch: '7 mm', loadFlankAngle: 7 }, pitch: 7 },
  { thread: { form: 'iso-metric', size: 'M20' }, pitch: 2.5 },
];
const threadEntries = FRICTION_LIBRARY.filter((e) => e.surface === 'thread').map((e) => e.id);
const collarEntries = FRICTION_LIBRARY.filter((e) => e.surface === 'collar').map((e) => e.id);

export const designInputArbitrary: fc.Arbitrary<DesignInput> = fc
  .record({
    size: fc.constantFrom(...SIZES),
    starts: fc.integer({ min: 1, max: 3 }),
    loadKn: fc.double({ min: 0.5, max: 80, noNaN: true }),
    sense: fc.constantFrom('compression' as const, 'tension' as const),
    thread: fc.oneof(
      fc.constantFrom(...threadEntries).map((entry) => ({ entry })),
      fc.record({
        min: fc.double({ min: 0.05, max: 0.2, noNaN: true }),
        extra: fc.constantFrom(0, 0.01, 0.05),
        kind: fc.constantFrom('assumed' as const, 'test' as const, 'supplier' as const),
      }).map(({ min, extra, kind }) => ({ min, max: min + extra, source: { kind, reference: 'property-test sample' } })),
    ),
    collar: fc.constantFrom('plain', 'none'),
    collarEntry: fc.constantFrom(...collarEntries),
    nutThreads: fc.integer({ min: 2, max: 14 }),
    nutMaterial: fc.constantFrom(...NUT_MATERIALS.map((m) => m.id)),
    screwMaterial: fc.constantFrom(...SCREW_MATERIALS.map((m) => m.id)),
    lengthMm: fc.integer({ min: 100, max: 2000 }),
    ends: fc.constantFrom('fixed-free' as const, 'pinned-pinned' as const, 'fixed-pinned' as const, 'fixed-fixed' as const),
    basis: fc.constantFrom('recommended' as const, 'theoretical' as const),
    kind: fc.constantFrom('lifting' as const, 'positioning' as const, 'clamping' as const),
    rpm: fc.option(fc.integer({ min: 5, max: 3000 }), { nil: undefined }),
    brake: fc.boolean(),
    brakeNm: fc.option(fc.integer({ min: 1, max: 400 }), { nil: undefined }),
    vibration: fc.boolean(),
    driveNm: fc.option(fc.integer({ min: 5, max: 800 }), { nil: undefined }),
  })
  .map((s): DesignInput => ({
    thread: { ...s.size.thread, starts: s.starts },
    load: { axial: `${s.loadKn} kN`, sense: s.sense },
    friction: s.collar === 'none' ? { thread: s.thread } : { thread: s.thread, collar: { entry: s.collarEntry } },
    collar: s.collar === 'none' ? { kind: 'none' } : { kind: 'plain', meanDiameter: '50 mm' },
    nut: { length: `${s.nutThreads * s.size.pitch} mm`, material: s.nutMaterial },
    screw: { material: s.screwMaterial, unsupportedLength: `${s.lengthMm} mm`, ends: s.ends, endConditionBasis: s.basis },
    duty: {
      kind: s.kind, brake: s.brake, vibration: s.vibration,
      ...(s.rpm === undefined ? {} : { speed: `${s.rpm} rpm` }),
      ...(s.brake && s.brakeNm !== undefined ? { brakeTorque: `${s.brakeNm} N*m` } : {}),
    },
    ...(s.driveNm === undefined ? {} : { drive: { availableTorque: `${s.driveNm} N*m` } }),
  }));

