import { parseDesign, type DesignInput } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
import { formatQuantity } from '@leadline/presentation';
import { engineValueRows, geometryRows } from './inputs';

const IN = 0.0254; // exact by definition (NIST SP 811, 2008, B.8)

function evaluated(thread: DesignInput['thread']) {
  const parsed = parseDesign({
    thread,
    load: { axial: '25 kN', sense: 'compression' },
    friction: { thread: { min: 0.15, max: 0.15, source: { kind: 'handbook', reference: 'single value for the test' } } },
    collar: { kind: 'none' },
    nut: { length: '2 in', material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '40 in', ends: 'pinned-pinned' },
    duty: { kind: 'lifting', brake: false },
  });
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  return evaluate(parsed.design);
}

const labels = (rows: { label: string; value: string }[]) => Object.fromEntries(rows.map((r) => [r.label, r.value]));

describe('geometry rows: which root the body, column and whirl checks used, from the evaluation', () => {
  it('Acme without a class: the checks use d - p - 0.020 in = 1.230 in for 1 1/2-4 (ASME B1.5, external minor max; from memory), not the basic 1.250 in', () => {
    const e = evaluated({ form: 'acme', size: '1 1/2-4 ACME' } as DesignInput['thread']);
    const rows = labels(geometryRows(e, 'US', e.engineVersion));
    expect(rows['Minimum-material minor diameter d_r,min (the section of the body, column and whirl checks)']).toBe(formatQuantity(1.23 * IN, 'length', 'US'));
    expect(rows['Basic minor diameter d_r (not used by the checks)']).toBe(formatQuantity(1.25 * IN, 'length', 'US'));
    expect(rows['Minor diameter d_r (the section of the body, column and whirl checks)']).toBeUndefined();
    expect(rows['Tolerance class']).toContain('d - p - 0.020 in');
  });

  it('trapezoidal without a class: the checks use the basic minor diameter d - 2 h_3 = 32 mm for Tr 40x7 (ISO 2904, Table 1)', () => {
    const e = evaluated({ form: 'trapezoidal', size: 'Tr 40x7' } as DesignInput['thread']);
    const rows = labels(geometryRows(e, 'SI', '1.2'));
    expect(rows['Minor diameter d_r (the section of the body, column and whirl checks)']).toBe(formatQuantity(0.032, 'length', 'SI'));
    expect(rows['Basic minor diameter d_r (not used by the checks)']).toBeUndefined();
    expect(rows['Tolerance class']).toContain('basic profile');
  });

  it('trapezoidal 7H/7e: the checks use the class minimum d3_min, below the basic 32 mm (ISO 2903)', () => {
    const e = evaluated({ form: 'trapezoidal', size: 'Tr 40x7', toleranceClass: '7H/7e' } as DesignInput['thread']);
    const rows = labels(geometryRows(e, 'SI', '1.2'));
    expect(rows['Basic minor diameter d_r (not used by the checks)']).toBe(formatQuantity(0.032, 'length', 'SI'));
    expect(e.geometry.minimumMaterial.minorDiameter).toBeLessThan(0.032);
    expect(rows['Minimum-material minor diameter d_r,min (the section of the body, column and whirl checks)']).toBe(formatQuantity(e.geometry.minimumMaterial.minorDiameter, 'length', 'SI'));
  });
});

describe('engine values: each with the unit its field declares, in the report\'s system', () => {
  const parsed = parseDesign({
    thread: { form: 'trapezoidal', size: 'Tr 40x7' },
    load: { axial: '25 kN', sense: 'compression' },
    friction: { thread: { min: 0.15, max: 0.15, source: { kind: 'handbook', reference: 'single value for the test' } } },
    collar: { kind: 'none' },
    nut: { length: '60 mm', material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '1 m', ends: 'pinned-pinned' },
    duty: { kind: 'lifting', brake: false, designLife: '5000 h', ambientTemperature: '40 degC' },
  } as DesignInput);
  if (!parsed.success) throw new Error(JSON.stringify(parsed.issues));
  const rows = (system: 'SI' | 'US') => Object.fromEntries(engineValueRows(parsed.design, system).map((r) => [r.path, r.value]));

  it('a design life in hours, not the seconds the engine works in', () => {
    expect(parsed.design.duty.designLife).toBe(5000 * 3600); // 1 h = 3600 s (BIPM, The International System of Units, 9th ed., Table 8)
    expect(rows('SI')['duty.designLife']).toBe('5000 h');
  });

  it('a temperature in degrees Celsius or Fahrenheit, not kelvin: 40 degC = 104 degF (NIST SP 811, 2008, B.8: t/degF = 1.8 t/degC + 32)', () => {
    expect(rows('SI')['duty.ambientTemperature']).toBe('40.0 °C');
    expect(rows('US')['duty.ambientTemperature']).toBe('104.0 °F'); // four significant figures, as the report rounds
  });

  it('every number the engine used has a unit, or is a count', () => {
    const leaf = (path: string): unknown => path.split('.').reduce<unknown>((o, k) => (o as Record<string, unknown>)[k], parsed.design);
    const COUNTS = new Set(['thread.starts', 'duty.cycles']); // dimensionless by nature: printed as whole numbers
    for (const [path, value] of Object.entries(rows('SI'))) {
      if (typeof leaf(path) !== 'number') continue; // a word (a form, a material, a kind)
      if (COUNTS.has(path)) {
        expect({ path, value }).toEqual({ path, value: expect.stringMatching(/^\d+$/) });
        continue;
      }
      expect({ path, value }).toEqual({ path, value: expect.stringMatching(/\d \S/) });
    }
  });
});
