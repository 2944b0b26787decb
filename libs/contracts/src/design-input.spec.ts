/**
 * The design-input contract: every validation error names the field at fault, and the same design means the same
 * thing whichever units it is written in (conversions per NIST SP 811 App. B.8, exact definitions of the inch,
 * pound and standard gravity).
 */
import { evaluate, FRICTION_LIBRARY, type Evaluation } from '@leadline/mechanics';
import { expectClose } from '../../mechanics/src/test-support';
import fc from 'fast-check';
import { parseDesign, PLAUSIBLE_RANGE, type DesignInput, type FieldIssue } from './design-input';
import { checkProperty } from '../../../test/support/property';

const IN = 0.0254;
const LBF = 4.4482216152605;
const PSI = LBF / IN ** 2;
const LB = 0.45359237;

const source = { kind: 'handbook' as const, reference: "Shigley's Mechanical Engineering Design, 10th ed., Ex. 8-1" };

/** Shigley 10th ed., Ex. 8-1 as a full SI design (the screw data are ours; the example does not need them). */
function shigleySi(): DesignInput {
  return {
    thread: { form: 'square', majorDiameter: '32 mm', pitch: '4 mm', starts: 2 },
    load: { axial: '6.4 kN', sense: 'compression' },
    friction: { thread: { min: 0.08, max: 0.08, source }, collar: { min: 0.08, max: 0.08, source } },
    collar: { kind: 'plain', meanDiameter: '40 mm' },
    nut: { length: '24 mm', allowablePressure: '10 MPa', allowablePv: '1.5 MPa*m/s', yieldStrength: '120 MPa' },
    screw: { yieldStrength: '500 MPa', elasticModulus: '207 GPa', density: '7850 kg/m^3', unsupportedLength: '600 mm', ends: 'fixed-pinned' },
    duty: { kind: 'lifting', speed: '60 rpm', brake: true },
    drive: { availableTorque: '40 N*m' },
  };
}

/** The same design written in inches, pounds, psi and lbf*in, each number converted by the exact NIST factors. */
function shigleyUs(): DesignInput {
  const inch = (mm: number) => `${mm / 25.4} in`;
  return {
    thread: { form: 'square', majorDiameter: inch(32), pitch: inch(4), starts: 2 },
    load: { axial: `${6400 / LBF} lbf`, sense: 'compression' },
    friction: { thread: { min: 0.08, max: 0.08, source }, collar: { min: 0.08, max: 0.08, source } },
    collar: { kind: 'plain', meanDiameter: inch(40) },
    nut: { length: inch(24), allowablePressure: `${10e6 / PSI} psi`, allowablePv: `${1.5e6 / PSI / (0.3048 / 60)} psi*ft/min`, yieldStrength: `${120e3 / PSI} ksi` },
    screw: {
      yieldStrength: `${500e3 / PSI} ksi`,
      elasticModulus: `${207e6 / PSI} ksi`,
      density: `${(7850 * IN ** 3) / LB} lb/in^3`,
      unsupportedLength: inch(600),
      ends: 'fixed-pinned',
    },
    duty: { kind: 'lifting', speed: '60 rpm', brake: true },
    drive: { availableTorque: `${40 / (LBF * IN)} lbf*in` },
  };
}

function parsed(input: unknown) {
  const r = parseDesign(input);
  if (!r.success) throw new Error(`rejected: ${JSON.stringify(r.issues)}`);
  return r.design;
}

/** Every numeric leaf of an evaluation, by path (trace excluded: it holds the same numbers again). */
function numericLeaves(value: unknown, path = '', out: Record<string, number> = {}): Record<string, number> {
  if (typeof value === 'number') out[path] = value;
  else if (value && typeof value === 'object') {
    for (const [key, child] of Object.entries(value)) if (key !== 'trace') numericLeaves(child, path ? `${path}.${key}` : key, out);
  }
  return out;
}

function expectSameEvaluation(a: Evaluation, b: Evaluation, rtol: number): void {
  const left = numericLeaves(a);
  const right = numericLeaves(b);
  expect(Object.keys(right).sort()).toEqual(Object.keys(left).sort());
  // Lowering torques are differences (f pi d_m - l cos alpha_n) that may cancel to near zero: judge them on the torque scale.
  const torqueScale = a.torque.raise.atMaxFriction;
  for (const [path, value] of Object.entries(left)) {
    expectClose(right[path], value, { rtol, atol: /orque/i.test(path) ? rtol * torqueScale : 0, label: path });
  }
}

describe('parseDesign: the same design in SI and in US customary units', () => {
  it('Shigley 10th ed., Ex. 8-1 written in in/lbf/psi/ksi/lb/in^3/lbf*in converts exactly (NIST SP 811 B.8) and evaluates identically', () => {
    const si = parsed(shigleySi());
    const us = parsed(shigleyUs());
    expect(si.unitSystem).toBe('SI');
    expect(us.unitSystem).toBe('US');
    expectClose(us.thread.majorDiameter, 0.032, { rtol: 1e-14 });
    expectClose(us.load.axial, 6400, { rtol: 1e-14 });
    expectClose(us.screw.yieldStrength, 500e6, { rtol: 1e-14 });
    expectClose(us.screw.density, 7850, { rtol: 1e-14 });
    expectClose(us.nut.allowablePv ?? NaN, 1.5e6, { rtol: 1e-14 });
    expectClose(us.drive?.availableTorque ?? NaN, 40, { rtol: 1e-14 });
    expectSameEvaluation(evaluate(si), evaluate(us), 1e-12);
  });

  it('law (fast-check): any design gives the same evaluation whether entered in mm/N/MPa/kg/m^3 or in/lbf/ksi/lb/in^3', () => {
    const arbitrary = fc.record({
      form: fc.constantFrom('square' as const, 'acme' as const, 'trapezoidal' as const, 'stub-acme' as const, 'iso-metric' as const),
      dMm: fc.double({ min: 8, max: 150, noNaN: true }),
      pRatio: fc.double({ min: 0.05, max: 0.25, noNaN: true }),
      starts: fc.integer({ min: 1, max: 4 }),
      loadN: fc.double({ min: 100, max: 5e5, noNaN: true }),
      sense: fc.constantFrom('compression' as const, 'tension' as const),
      fMin: fc.integer({ min: 5, max: 200 }),
      fSpan: fc.integer({ min: 0, max: 100 }),
      collarMm: fc.double({ min: 10, max: 300, noNaN: true }),
      nutThreads: fc.integer({ min: 2, max: 20 }),
      yieldMpa: fc.double({ min: 150, max: 1200, noNaN: true }),
      lengthMm: fc.double({ min: 50, max: 3000, noNaN: true }),
      linearMmPerMin: fc.double({ min: 1, max: 5000, noNaN: true }),
    });
    checkProperty(
      fc.property(arbitrary, (r) => {
        const pMm = r.pRatio * r.dMm;
        const friction = { min: r.fMin / 1000, max: (r.fMin + r.fSpan) / 1000, source };
        const input = (mm: (x: number) => string, N: (x: number) => string, MPa: (x: number) => string, density: string, speed: string): DesignInput => ({
          thread: { form: r.form, majorDiameter: mm(r.dMm), pitch: mm(pMm), starts: r.starts },
          load: { axial: N(r.loadN), sense: r.sense },
          friction: { thread: friction, collar: friction },
          collar: { kind: 'annular', outerDiameter: mm(1.5 * r.collarMm), innerDiameter: mm(r.collarMm), model: 'uniform-pressure' },
          nut: { length: mm(r.nutThreads * pMm) },
          screw: { yieldStrength: MPa(r.yieldMpa), elasticModulus: MPa(207000), density, unsupportedLength: mm(r.lengthMm), ends: 'fixed-free' },
          duty: { kind: 'positioning', linearSpeed: speed, brake: false },
        });
        const si = parsed(input((x) => `${x} mm`, (x) => `${x} N`, (x) => `${x} MPa`, '7850 kg/m^3', `${r.linearMmPerMin} mm/min`));
        const us = parsed(
          input(
            (x) => `${x / 25.4} in`,
            (x) => `${x / LBF} lbf`,
            (x) => `${(x * 1e3) / PSI} ksi`,
            `${(7850 * IN ** 3) / LB} lb/in^3`,
            `${r.linearMmPerMin / 25.4} in/min`,
          ),
        );
        expect([si.unitSystem, us.unitSystem]).toEqual(['SI', 'US']);
        expectSameEvaluation(evaluate(si), evaluate(us), 1e-12);
      }),
      { numRuns: 100 },
    );
  });
});

describe('parseDesign: library entries and standard sizes', () => {
  it('a named size supplies major diameter and pitch; inch sizes count as US customary', () => {
    const input = { ...shigleySi(), thread: { form: 'acme' as const, size: '1 1/2-4 acme' } };
    const design = parsed(input);
    expect(design.thread.size).toBe('1-1/2-4 ACME');
    expectClose(design.thread.majorDiameter, 1.5 * IN, { rtol: 1e-15 });
    expectClose(design.thread.pitch, IN / 4, { rtol: 1e-15 });
    expect(design.thread.starts).toBe(1);
    // the size is one US vote against the rest of the design in SI (11 quantities): SI by majority
    expect(design.unitSystem).toBe('SI');
  });

  it('unit-system vote: the design is reported in the system most of its quantities were entered in; the size is a vote', () => {
    const mixed = (thread: DesignInput['thread'], collarDiameter: string): DesignInput => ({
      thread,
      load: { axial: '6.4 kN', sense: 'compression' }, // SI
      friction: { thread: { min: 0.1, max: 0.15, source }, collar: { min: 0.1, max: 0.15, source } },
      collar: { kind: 'plain', meanDiameter: collarDiameter },
      nut: { length: '2 in' }, // US
      screw: { material: 'steel-1045-cd', unsupportedLength: '12 in', ends: 'pinned-pinned' }, // US (library material: no vote)
      duty: { kind: 'positioning', speed: '60 rpm', brake: false }, // rev/min counts for neither
    });
    // inch size: US 3 (size, nut, span) against SI 2 (load, collar)
    expect(parsed(mixed({ form: 'acme', size: '1-1/2-4 ACME' }, '40 mm')).unitSystem).toBe('US');
    // metric size instead: US 2 against SI 3
    expect(parsed(mixed({ form: 'trapezoidal', size: 'Tr 40x7' }, '40 mm')).unitSystem).toBe('SI');
    // a tie is reported in SI (US only when more quantities are in US units): US 3 (d, nut, span), SI 3 (p, load, collar)
    expect(parsed(mixed({ form: 'acme', majorDiameter: '1.5 in', pitch: '6.35 mm' }, '40 mm')).unitSystem).toBe('SI');
    // one more US quantity tips it: the collar in inches makes US 4 against SI 2
    expect(parsed(mixed({ form: 'acme', majorDiameter: '1.5 in', pitch: '6.35 mm' }, '1.6 in')).unitSystem).toBe('US');
  });

  it('a friction-library entry supplies its Shigley Table 8-5 range and source (public source, read: friction-and-materials.md §1)', () => {
    const design = parsed({ ...shigleySi(), friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } } });
    expect(design.friction.thread).toMatchObject({ min: 0.1, max: 0.16, entry: 'thread/steel-bronze/oil', source: { kind: 'handbook' } });
    expect(design.friction.collar).toMatchObject({ min: 0.06, max: 0.08 }); // Table 8-6 running..starting
  });

  it('Shigley 9th ed., Tables 8-5 and 8-6 as shipped in the friction library (public source, read: friction-and-materials.md §1, §1.1)', () => {
    const table: Record<string, [number, number]> = {
      'thread/steel-steel/dry': [0.15, 0.25], 'thread/steel-bronze/dry': [0.15, 0.23], 'thread/steel-brass/dry': [0.15, 0.19],
      'thread/steel-cast-iron/dry': [0.15, 0.25], 'thread/steel-steel/oil': [0.11, 0.17], 'thread/steel-bronze/oil': [0.1, 0.16],
      'thread/steel-brass/oil': [0.1, 0.15], 'thread/steel-cast-iron/oil': [0.11, 0.17], 'thread/bronze-steel': [0.08, 0.12],
      'thread/bronze-bronze': [0.04, 0.06], 'thread/bronze-cast-iron': [0.06, 0.09],
      'collar/soft-steel-cast-iron': [0.12, 0.17], 'collar/hard-steel-cast-iron': [0.09, 0.15],
      'collar/soft-steel-bronze': [0.08, 0.1], 'collar/hard-steel-bronze': [0.06, 0.08],
    };
    expect(Object.fromEntries(FRICTION_LIBRARY.map((e) => [e.id, [e.min, e.max]]))).toEqual(table);
  });

  it('a screw material supplies Sy, E and density; a nut material its allowables (overridable field by field)', () => {
    const design = parsed({
      ...shigleySi(),
      screw: { material: 'steel-1018-cd', yieldStrength: '400 MPa', unsupportedLength: '600 mm', ends: 'fixed-free' },
      nut: { length: '24 mm', material: 'bronze' },
    });
    expect(design.screw.yieldStrength).toBe(400e6);
    expect(design.screw.elasticModulus).toBe(207e9);
    // Shigley 9th ed. Table 8-4 (from memory), steel/bronze by rubbing speed: 1600 psi (jack), 800 psi (hoist), 150 psi (lead screw)
    expect(design.nut.allowablePressure).toBeNull(); // no single value: the speed-rated steps apply
    expect(design.nut.materialSource).toBe('library');
    expect((design.nut.pressureBySpeed ?? []).map((s) => s.allowablePressure)).toEqual([1600 * PSI, 800 * PSI, 150 * PSI]);
    expectClose(design.nut.yieldStrength ?? NaN, 14000 * PSI, { rtol: 1e-15 }); // ASTM B584 C93200 minimum 14 ksi (from memory)
  });

});

describe('parseDesign: every validation error names the field at fault', () => {
  type Mutation = (d: Record<string, any>) => void; // eslint-disable-line @typescript-eslint/no-explicit-any
  const otherSource = { kind: 'handbook', reference: 'x' };
  const cases: ReadonlyArray<readonly [string, string, RegExp, Mutation]> = [
    ['wrong dimension ("12 MPa" for a length)', 'thread.majorDiameter', /is not a length/, (d) => (d.thread.majorDiameter = '12 MPa')],
    ['unknown unit', 'collar.meanDiameter', /unknown unit "furlongz"/, (d) => (d.collar.meanDiameter = '40 furlongz')],
    ['not a number', 'load.axial', /expected "<number> <unit>"/, (d) => (d.load.axial = 'lots kN')],
    ['NaN', 'load.axial', /expected "<number> <unit>"/, (d) => (d.load.axial = 'NaN kN')],
    ['a number, not a string', 'load.axial', /expected string, received number/, (d) => (d.load.axial = 6400)],
    ['non-finite ("1e999 mm")', 'thread.majorDiameter', /not a finite number/, (d) => (d.thread.majorDiameter = '1e999 mm')],
    ['negative size', 'thread.pitch', /greater than zero/, (d) => (d.thread.pitch = '-4 mm')],
    ['zero size', 'nut.length', /greater than zero/, (d) => (d.nut.length = '0 mm')],
    ['zero load', 'load.axial', /greater than zero/, (d) => (d.load.axial = '0 kN')],
    ['pitch equal to the major diameter', 'thread.pitch', /smaller than the major diameter/, (d) => { d.thread.pitch = '32 mm'; d.nut.length = '64 mm'; }],
    ['pitch above the major diameter', 'thread.pitch', /smaller than the major diameter/, (d) => { d.thread.pitch = '40 mm'; d.nut.length = '80 mm'; }],
    ['friction min > max', 'friction.thread.min', /must not exceed max/, (d) => (d.friction.thread = { min: 0.2, max: 0.1, source: otherSource })],
    ['friction above 1', 'friction.thread.max', /within 0..1/, (d) => (d.friction.thread = { min: 0.1, max: 1.2, source: otherSource })],
    ['friction below 0', 'friction.collar.min', /within 0..1/, (d) => (d.friction.collar = { min: -0.1, max: 0.2, source: otherSource })],
    ['annular collar inner = outer', 'collar.innerDiameter', /smaller than the outer/, (d) => (d.collar = { kind: 'annular', outerDiameter: '50 mm', innerDiameter: '50 mm', model: 'uniform-wear' })],
    ['annular collar inner > outer', 'collar.innerDiameter', /smaller than the outer/, (d) => (d.collar = { kind: 'annular', outerDiameter: '20 mm', innerDiameter: '50 mm', model: 'uniform-wear' })],
    ['starts 0', 'thread.starts', /at least 1/, (d) => (d.thread.starts = 0)],
    ['starts 1.5', 'thread.starts', /whole number/, (d) => (d.thread.starts = 1.5)],
    ['starts -1', 'thread.starts', /at least 1/, (d) => (d.thread.starts = -1)],
    ['unknown size', 'thread.size', /unknown standard size "Tr 23x5"/, (d) => (d.thread = { form: 'trapezoidal', size: 'Tr 23x5' })],
    ['size of another form', 'thread.size', /is a trapezoidal size, but thread.form is acme/, (d) => (d.thread = { form: 'acme', size: 'Tr 24x5' })],
    ['size disagreeing with a given major diameter', 'thread.majorDiameter', /disagrees with size Tr 24x5/, (d) => (d.thread = { form: 'trapezoidal', size: 'Tr 24x5', majorDiameter: '25 mm' })],
    ['neither size nor major diameter', 'thread.majorDiameter', /required unless thread.size/, (d) => delete d.thread.majorDiameter],
    ['nut material of its own without an allowable pressure', 'nut.material', /"unobtainium" is not a library nut material.*needs nut.allowablePressure/, (d) => { d.nut.material = 'unobtainium'; delete d.nut.allowablePressure; }],
    ['nut material of its own without a pV limit at speed', 'nut.material', /needs nut.allowablePv \(a speed is given\)/, (d) => { d.nut.material = 'unobtainium'; delete d.nut.allowablePv; }],
    ['a value overflowing on conversion ("1e308 GPa")', 'screw.elasticModulus', /too large to compute with/, (d) => (d.screw.elasticModulus = '1e308 GPa')],
    ['friction range inside the choice with "min": "NaN"', 'friction.collar.min', /expected number, received string/, (d) => (d.friction.collar = { min: 'NaN', max: 0.2, source: otherSource })],
    ['friction range inside the choice with a bad source kind', 'friction.thread.source.kind', /expected one of/, (d) => (d.friction.thread = { min: 0.1, max: 0.2, source: { kind: 'guess', reference: 'x' } })],
    ['friction entry inside the choice that is not a string', 'friction.thread.entry', /expected string/, (d) => (d.friction.thread = { entry: 5 })],
    ['a choice no form matches says what each form found', 'thread.loadFlankAngle', /matches none of the accepted forms: .*expected number, received boolean; or .*expected string, received boolean/, (d) => { d.thread.form = 'buttress'; d.thread.loadFlankAngle = true; }],
    ['both a single allowable and steps', 'nut.allowablePressureBySpeed', /not both/, (d) => (d.nut.allowablePressureBySpeed = [{ allowablePressure: '5 MPa' }])],
    ['steps whose allowable rises with speed', 'nut.allowablePressureBySpeed.1.allowablePressure', /never rises with speed/, (d) => { delete d.nut.allowablePressure; d.nut.allowablePressureBySpeed = [{ upToRubbingSpeed: '3 m/min', allowablePressure: '5 MPa' }, { allowablePressure: '8 MPa' }]; }],
    ['steps out of speed order', 'nut.allowablePressureBySpeed.1.upToRubbingSpeed', /low to high speed/, (d) => { delete d.nut.allowablePressure; d.nut.allowablePressureBySpeed = [{ upToRubbingSpeed: '6 m/min', allowablePressure: '5 MPa' }, { upToRubbingSpeed: '3 m/min', allowablePressure: '4 MPa' }]; }],
    ['an open step before the last', 'nut.allowablePressureBySpeed.0.upToRubbingSpeed', /only the last step/, (d) => { delete d.nut.allowablePressure; d.nut.allowablePressureBySpeed = [{ allowablePressure: '5 MPa' }, { upToRubbingSpeed: '3 m/min', allowablePressure: '4 MPa' }]; }],
    ['unknown screw material', 'screw.material', /unknown screw material/, (d) => (d.screw = { material: 'unobtainium', unsupportedLength: '600 mm', ends: 'fixed-free' })],
    ['screw data missing without a material', 'screw.yieldStrength', /required unless screw.material/, (d) => delete d.screw.yieldStrength],
    ['unknown friction entry', 'friction.thread.entry', /unknown friction-library entry/, (d) => (d.friction.thread = { entry: 'thread/teflon-on-ice' })],
    ['collar entry used for the thread', 'friction.thread.entry', /is a collar entry, not a thread entry/, (d) => (d.friction.thread = { entry: 'collar/hard-steel-bronze' })],
    ['collar friction missing for a collar', 'friction.collar', /required for a plain collar/, (d) => delete d.friction.collar],
    ['buttress without load-flank angle', 'thread.loadFlankAngle', /required for a buttress thread/, (d) => (d.thread.form = 'buttress')],
    ['buttress with an untabulated load-flank angle', 'thread.loadFlankAngle', /tabulated for 3 deg/, (d) => { d.thread.form = 'buttress'; d.thread.loadFlankAngle = '5 deg'; }],
    ['load-flank angle on a non-buttress thread', 'thread.loadFlankAngle', /only a buttress thread/, (d) => (d.thread.loadFlankAngle = 7)],
    ['both speed and linearSpeed', 'duty.linearSpeed', /either duty.speed or duty.linearSpeed/, (d) => (d.duty.linearSpeed = '1 m/min')],
    ['nut shorter than one pitch', 'nut.length', /at least one full pitch/, (d) => (d.nut.length = '3 mm')],
    ['unknown end condition', 'screw.ends', /expected one of "fixed-free"/, (d) => (d.screw.ends = 'glued')],
    ['unknown extra field at the top (schema is strict)', '(body)', /Unrecognized key: "colour"/, (d) => (d.colour = 'red')],
    ['unknown extra field inside a section', 'thread', /Unrecognized key: "colour"/, (d) => (d.thread.colour = 'red')],
    ['unknown extra field in a friction range', 'friction.thread', /Unrecognized key: "typical"/, (d) => (d.friction.thread.typical = 0.1)],
  ];

  it.each(cases)('%s -> %s', (_name, path, message, mutate) => {
    const input = shigleySi() as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
    mutate(input);
    const result = parseDesign(input);
    expect(result.success).toBe(false);
    const issues: readonly FieldIssue[] = result.success ? [] : result.issues;
    expect(issues.map((i) => i.path)).toEqual([path]);
    expect(issues[0].message).toMatch(message);
  });

  it('never throws on junk, and reports the body itself when it is not an object', () => {
    for (const junk of [null, undefined, 42, 'design', [], {}]) {
      const result = parseDesign(junk);
      expect(result.success).toBe(false);
    }
    const result = parseDesign(null);
    expect(result.success ? [] : result.issues.map((i) => i.path)).toEqual(['(body)']);
  });

  it('reports several independent problems at once, each with its own path', () => {
    const input = shigleySi() as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
    input.collar = { kind: 'annular', outerDiameter: '20 mm', innerDiameter: '50 mm', model: 'uniform-wear' };
    input.nut.material = 'unobtainium';
    delete input.nut.allowablePressure;
    input.duty.linearSpeed = '1 m/min';
    const result = parseDesign(input);
    expect(result.success ? [] : result.issues.map((i) => i.path).sort()).toEqual(['collar.innerDiameter', 'duty.linearSpeed', 'nut.material']);
  });
});

describe("parseDesign: a nut material of the design's own", () => {
  it('a name that is not a library id is accepted when the design gives the allowables, and kept as entered', () => {
    const input = shigleySi();
    const design = parsed({ ...input, nut: { ...input.nut, material: 'CuSn12 centrifugal cast (our spec N-12)' } });
    expect(design.nut.material).toBe('CuSn12 centrifugal cast (our spec N-12)');
    expect(design.nut.materialSource).toBe('design');
    expect(design.nut.allowablePressure).toBe(10e6);
    expect(design.nut.allowablePv).toBe(1.5e6);
    expect(design.nut.yieldStrength).toBe(120e6);
  });

  it('without a speed, pV is not needed', () => {
    const input = shigleySi();
    const design = parsed({ ...input, duty: { kind: 'lifting', brake: true }, nut: { length: '24 mm', material: 'own bronze', allowablePressure: '10 MPa' } });
    expect(design.nut.allowablePv).toBeNull();
  });

  it('a library id still supplies its values', () => {
    const design = parsed({ ...shigleySi(), nut: { length: '24 mm', material: 'manganese-bronze' } });
    expect(design.nut.materialSource).toBe('library');
    expectClose(design.nut.yieldStrength ?? NaN, 45000 * PSI, { rtol: 1e-15 }); // ASTM B584 C86200 minimum 45 ksi (from memory)
    expectClose(design.nut.allowablePv ?? NaN, 150000 * PSI * (0.3048 / 60), { rtol: 1e-12 }); // Mott Table 16-1
  });

  it("the design's own pressure-speed steps replace the library's, in engine units", () => {
    const input = shigleySi();
    const design = parsed({
      ...input,
      nut: { length: '24 mm', material: 'bronze', allowablePressureBySpeed: [{ upToRubbingSpeed: '3 m/min', allowablePressure: '12 MPa' }, { allowablePressure: '2 MPa' }] },
    });
    expect(design.nut.pressureBySpeed?.map((s) => [s.upToRubbingSpeed, s.allowablePressure])).toEqual([[0.05, 12e6], [null, 2e6]]);
  });
});

describe('parseDesign: units', () => {
  it('"kpsi" is accepted as ksi (1 kpsi = 1000 lbf/in^2, NIST SP 811 B.8)', () => {
    const input = shigleySi();
    const design = parsed({ ...input, screw: { ...input.screw, yieldStrength: '54 kpsi' } });
    expectClose(design.screw.yieldStrength, 54000 * PSI, { rtol: 1e-15 });
    expect(parsed({ ...input, screw: { ...input.screw, yieldStrength: '54 ksi' } }).screw.yieldStrength).toBe(design.screw.yieldStrength);
  });
});

describe('parseDesign: plausible magnitudes (sanity bounds, common practice)', () => {
  type Mutation = (d: Record<string, any>) => void; // eslint-disable-line @typescript-eslint/no-explicit-any
  // Finite values that overflow the engine's figures to Infinity/NaN (the fuzz suite found a length of 1.9e229 mm).
  const cases: ReadonlyArray<readonly [string, string, RegExp, Mutation]> = [
    ['a length of 1.9345105578188634e+229 mm (above 1 km)', 'screw.unsupportedLength', /outside the plausible range 1 um to 1 km/, (d) => (d.screw.unsupportedLength = '1.9345105578188634e+229 mm')],
    ['a length of 1001 m (above 1 km)', 'nut.length', /1 um to 1 km/, (d) => (d.nut.length = '1001 m')],
    ['a pitch of 1e-4 mm (below 1 um)', 'thread.pitch', /1 um to 1 km/, (d) => (d.thread.pitch = '1e-4 mm')],
    ['a force of 2e9 N (above 1 GN)', 'load.axial', /1 mN to 1 GN/, (d) => (d.load.axial = '2e9 N')],
    ['a stress of 2e13 Pa (above 10 TPa)', 'screw.elasticModulus', /1 Pa to 10 TPa/, (d) => (d.screw.elasticModulus = '2e13 Pa')],
    ['a speed of 2e6 rpm (above 1e6 rpm)', 'duty.speed', /1e-6 rpm to 1e6 rpm/, (d) => (d.duty.speed = '2e6 rpm')],
    ['a density of 1e6 kg/m^3 (above 100,000)', 'screw.density', /1 to 100,000 kg\/m\^3/, (d) => (d.screw.density = '1e6 kg/m^3')],
    ['a torque of 1e10 N*m (above 1 GN*m)', 'drive.availableTorque', /1 uN\*m to 1 GN\*m/, (d) => (d.drive.availableTorque = '1e10 N*m')],
  ];
  it.each(cases)('%s -> 422 at %s', (_name, path, message, mutate) => {
    const input = shigleySi() as Record<string, any>; // eslint-disable-line @typescript-eslint/no-explicit-any
    mutate(input);
    const result = parseDesign(input);
    expect(result.success ? [] : result.issues.map((i) => i.path)).toEqual([path]);
    expect(result.success ? '' : result.issues[0].message).toMatch(message);
  });

  it('the bounds themselves are accepted (1 km, 1 GN, 10 TPa, 1e6 rpm are inclusive)', () => {
    const input = shigleySi();
    expect(PLAUSIBLE_RANGE.length.max).toBe(1e3);
    expect(PLAUSIBLE_RANGE.force.max).toBe(1e9);
    expect(PLAUSIBLE_RANGE.stress.max).toBe(1e13);
    expect(PLAUSIBLE_RANGE.rotationalSpeed.max).toBe(1e6);
    const design = parsed({ ...input, load: { ...input.load, axial: '1 GN' }, screw: { ...input.screw, unsupportedLength: '1 km', elasticModulus: '10000 GPa' }, duty: { ...input.duty, speed: '1000000 rpm' } });
    expect(design.load.axial).toBe(1e9);
    expect(design.screw.unsupportedLength).toBe(1e3);
    expect(design.screw.elasticModulus).toBe(1e13);
  });

  it('within the bounds, the engine computes finite figures even at the extremes (no overflow left to the engine)', () => {
    const input = shigleySi();
    const extremes = [
      { ...input, load: { ...input.load, axial: '1 GN' }, screw: { ...input.screw, unsupportedLength: '1 km', elasticModulus: '10000 GPa', density: '100000 kg/m^3' }, duty: { ...input.duty, speed: '1000000 rpm' } },
      { ...input, load: { ...input.load, axial: '1 mN' }, screw: { ...input.screw, yieldStrength: '1 Pa', elasticModulus: '1 Pa', density: '1 kg/m^3' } },
    ];
    for (const e of extremes) {
      const leaves = numericLeaves(evaluate(parsed(e)));
      expect(Object.entries(leaves).filter(([, v]) => !Number.isFinite(v))).toEqual([]);
    }
  });
});
