/**
 * Leadline contract examples, computed independently from the engine issue's conventions; not a published source.
 *
 * Copied verbatim from shared/contract/examples.json (the three design inputs of POST /api/v1/evaluations and the
 * Evaluation fields they must produce), so that the suite needs nothing outside the repository. They check field
 * names, SI units and conventions; the engine's correctness against published sources is tested elsewhere.
 */
import { parseDesign, type DesignInput } from '@leadline/contracts';
import { evaluate } from './evaluate';
import { expectClose } from './test-support';
import { ENGINE_1_2_CHANGES } from '../../../test/support/contract-changes';

interface ContractExample {
  readonly name: string;
  readonly input: DesignInput;
  readonly expect: Readonly<Record<string, number | boolean | string>>;
}

const EXAMPLES: readonly ContractExample[] = [
  {
    name: "trapezoidal-jack-SI",
    input: {
      thread: {"form": "trapezoidal", "majorDiameter": "32 mm", "pitch": "6 mm", "starts": 1},
      load: {"axial": "12 kN", "sense": "compression"},
      friction: {"thread": {"min": 0.1, "max": 0.16, "source": {"kind": "handbook", "reference": "Shigley's Mechanical Engineering Design, 10th ed., Table 8-5"}}, "collar": {"min": 0.08, "max": 0.12, "source": {"kind": "handbook", "reference": "Shigley's Mechanical Engineering Design, 10th ed., Table 8-5"}}},
      collar: {"kind": "plain", "meanDiameter": "50 mm"},
      nut: {"length": "48 mm", "material": "bronze"},
      screw: {"yieldStrength": "355 MPa", "elasticModulus": "205 GPa", "density": "7850 kg/m^3", "unsupportedLength": "300 mm", "ends": "fixed-free"},
      duty: {"kind": "lifting", "speed": "30 rpm", "brake": false, "vibration": false},
      drive: {"availableTorque": "250 N*m"},
    },
    expect: {
      "geometry.lead": 0.006,
      "geometry.meanDiameter": 0.029,
      "geometry.minorDiameter": 0.025,
      "geometry.threadHeight": 0.003,
      "geometry.leadAngle": 3.7678995739349546,
      "geometry.normalFlankAngle": 14.969033484119926,
      "geometry.engagedThreads": 8.0,
      "torque.raise.atMinFriction": 53.67263570825929,
      "torque.raise.atMaxFriction": 76.72123382726542,
      "torque.lower.atMinFriction": 30.50768070849833,
      "torque.lower.atMaxFriction": 53.17146966371027,
      "torque.collar.atMinFriction": 24.0,
      "torque.collar.atMaxFriction": 36.0,
      "efficiency.atMinFriction": 0.21350089764369629,
      "efficiency.atMaxFriction": 0.14936094391307972,
      "selfLocking.locks": true,
      "selfLocking.margin": 1.5717736960087767,
      "stresses.body.axial": -24446199.258915123,
      "stresses.body.torsion": 25007234.260415327,
      "stresses.body.vonMises": 49736324.293944895,
      "buckling.applies": true,
      "buckling.slenderness": 47.99999999999999,
      "buckling.transitionSlenderness": 53.38234268158047,
      "buckling.regime": "johnson",
      "buckling.criticalLoad": 103814.35786345569,
      "criticalSpeed.rpm": 11915.159483571255,
      "wear.bearingPressure": 5488101.485927424,
      "wear.slidingVelocity": 0.04565177242264574,
      "wear.pv": 250541.5600679427,
      "power.input": 241.02686456608177,
      "power.linearSpeed": 0.003,
    },
  },
  {
    name: "trapezoidal-3-start-lift-SI",
    input: {
      thread: {"form": "trapezoidal", "majorDiameter": "32 mm", "pitch": "6 mm", "starts": 3},
      load: {"axial": "12 kN", "sense": "compression"},
      friction: {"thread": {"min": 0.1, "max": 0.16, "source": {"kind": "handbook", "reference": "Shigley's Mechanical Engineering Design, 10th ed., Table 8-5"}}, "collar": {"min": 0.08, "max": 0.12, "source": {"kind": "handbook", "reference": "Shigley's Mechanical Engineering Design, 10th ed., Table 8-5"}}},
      collar: {"kind": "plain", "meanDiameter": "50 mm"},
      nut: {"length": "48 mm", "material": "bronze"},
      screw: {"yieldStrength": "355 MPa", "elasticModulus": "205 GPa", "density": "7850 kg/m^3", "unsupportedLength": "300 mm", "ends": "fixed-free"},
      duty: {"kind": "lifting", "speed": "30 rpm", "brake": false, "vibration": false},
      drive: {"availableTorque": "250 N*m"},
    },
    expect: {
      "geometry.lead": 0.018000000000000002,
      "geometry.meanDiameter": 0.029,
      "geometry.minorDiameter": 0.025,
      "geometry.threadHeight": 0.003,
      "geometry.leadAngle": 11.176087515054547,
      "geometry.normalFlankAngle": 14.72801916043464,
      "geometry.engagedThreads": 8.0,
      "torque.raise.atMinFriction": 77.46070739267071,
      "torque.raise.atMaxFriction": 101.29754279330503,
      "torque.lower.atMinFriction": 7.9417017543743285,
      "torque.lower.atMaxFriction": 30.585312844742873,
      "torque.collar.atMinFriction": 24.0,
      "torque.collar.atMaxFriction": 36.0,
      "efficiency.atMinFriction": 0.4438052383588505,
      "efficiency.atMaxFriction": 0.3393711906516402,
      "selfLocking.locks": false,
      "selfLocking.margin": 0.5233406011756382,
      "stresses.body.axial": -24446199.258915123,
      "stresses.body.torsion": 33017865.540848214,
      "stresses.body.vonMises": 62194493.26770963,
      "buckling.applies": true,
      "buckling.slenderness": 47.99999999999999,
      "buckling.transitionSlenderness": 53.38234268158047,
      "buckling.regime": "johnson",
      "buckling.criticalLoad": 103814.35786345569,
      "criticalSpeed.rpm": 11915.159483571255,
      "wear.bearingPressure": 5488101.485927424,
      "wear.slidingVelocity": 0.046433655093359144,
      "wear.pv": 254832.61151490585,
      "power.input": 318.23561626614475,
      "power.linearSpeed": 0.009000000000000001,
    },
  },
  {
    name: "acme-positioning-US",
    input: {
      thread: {"form": "acme", "majorDiameter": "1.25 in", "pitch": "0.2 in", "starts": 1},
      load: {"axial": "3500 lbf", "sense": "compression"},
      friction: {"thread": {"min": 0.12, "max": 0.18, "source": {"kind": "assumed", "reference": "engineering estimate pending a friction test"}}, "collar": {"min": 0.1, "max": 0.15, "source": {"kind": "assumed", "reference": "engineering estimate"}}},
      collar: {"kind": "annular", "outerDiameter": "2.5 in", "innerDiameter": "1.5 in", "model": "uniform-wear"},
      nut: {"length": "1.6 in", "material": "bronze"},
      screw: {"yieldStrength": "50 ksi", "elasticModulus": "29000 ksi", "density": "0.283 lb/in^3", "unsupportedLength": "28 in", "ends": "pinned-pinned"},
      duty: {"kind": "positioning", "linearSpeed": "20 in/min", "brake": false},
      drive: {"availableTorque": "900 lbf*in"},
    },
    expect: {
      "geometry.lead": 0.00508,
      "geometry.meanDiameter": 0.02921,
      "geometry.minorDiameter": 0.02667,
      "geometry.threadHeight": 0.00254,
      "geometry.leadAngle": 3.1685594953930836,
      "geometry.normalFlankAngle": 14.478765440522713,
      "geometry.engagedThreads": 8.0,
      "torque.raise.atMinFriction": 80.59464475792676,
      "torque.raise.atMaxFriction": 114.74621561594745,
      "torque.lower.atMinFriction": 55.03181850410889,
      "torque.lower.atMaxFriction": 88.69846974602443,
      "torque.collar.atMinFriction": 39.54469015966584,
      "torque.collar.atMaxFriction": 59.31703523949876,
      "efficiency.atMinFriction": 0.1561824096589058,
      "efficiency.atMaxFriction": 0.10969830905819516,
      "selfLocking.locks": true,
      "selfLocking.margin": 2.2388024737409533,
      "stresses.body.axial": -27868817.895279765,
      "stresses.body.torsion": 30806292.461340286,
      "stresses.body.vonMises": 60197624.34283565,
      "buckling.applies": true,
      "buckling.slenderness": 106.66666666666666,
      "buckling.transitionSlenderness": 106.99879020467314,
      "buckling.regime": "johnson",
      "buckling.criticalLoad": 96889.8996281829,
      "criticalSpeed.rpm": 6276.73268399617,
      "wear.bearingPressure": 8349285.796072267,
      "wear.slidingVelocity": 0.15317737297071568,
      "wear.pv": 1278921.6644240604,
      "power.input": 1201.6195600209696,
      "power.linearSpeed": 0.008466666666666667,
    },
  },
];

function at(value: unknown, path: string): unknown {
  return path.split('.').reduce<unknown>((node, key) => (node as Record<string, unknown> | null)?.[key], value);
}

describe('Leadline contract examples (computed independently from the engine issue; not a published source)', () => {
  it.each(EXAMPLES.map((e) => [e.name, e] as const))('%s reproduces every expected field within 0.5 %%', (_name, example) => {
    const parsed = parseDesign(example.input);
    if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
    const evaluation = evaluate(parsed.design);
    const changed = ENGINE_1_2_CHANGES[example.name] ?? {};
    for (const [path, contract] of Object.entries(example.expect)) {
      const expected = changed[path] ?? contract;
      const actual = at(evaluation, path);
      if (typeof expected === 'number') expectClose(actual as number, expected, { rtol: 0.005, label: path });
      else expect([path, actual]).toEqual([path, expected]);
    }
  });

  it('every engine 1.2 change names a field the contract checks, and moves it on the safe side', () => {
    for (const [name, fields] of Object.entries(ENGINE_1_2_CHANGES)) {
      const example = EXAMPLES.find((e) => e.name === name);
      for (const [path, value] of Object.entries(fields)) {
        const contract = example?.expect[path];
        expect([name, path, contract !== undefined]).toEqual([name, path, true]);
        if (typeof value !== 'number' || typeof contract !== 'number') continue;
        // stresses rise in magnitude; critical load, speed and slenderness margin fall
        if (path.startsWith('stresses.') || path === 'buckling.slenderness') expect(Math.abs(value)).toBeGreaterThan(Math.abs(contract));
        else expect(value).toBeLessThan(contract);
      }
    }
  });

  it('the US example is reported as a US-customary design and the SI ones as SI', () => {
    const systems = EXAMPLES.map((e) => {
      const parsed = parseDesign(e.input);
      return parsed.success ? parsed.design.unitSystem : null;
    });
    expect(systems).toEqual(['SI', 'SI', 'US']);
  });
});
