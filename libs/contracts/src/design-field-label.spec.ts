import fc from 'fast-check';
import { designInputArbitrary } from '../../rules/src/testing/arbitrary';
import { checkProperty } from '../../../test/support/property';
import { designFieldDimension, designFieldLabel, designInputFields } from './design-input';

describe('designFieldLabel', () => {
  it('names a field by the contract\'s description of it', () => {
    expect(designFieldLabel('load.axial')).toBe('Axial load');
    expect(designFieldLabel('design.nut.length')).toBe('Nut length');
    expect(designFieldLabel('collar.outerDiameter')).toBe('Collar outer diameter'); // inside a discriminated union
    // with the input at hand, from the option it chose: a rolling bearing's mean diameter, not a plain collar's
    expect(designFieldLabel('collar.meanDiameter')).toBe('Collar mean diameter');
    expect(designFieldLabel('collar.meanDiameter', { collar: { kind: 'rolling', meanDiameter: '32 mm' } })).toBe('Bearing mean diameter');
    expect(designFieldLabel('nut.allowablePressureBySpeed.0.allowablePressure')).toBe('Allowable mean bearing pressure up to that rubbing speed (step 1)');
  });

  it('names the surface of a friction range, and falls back to the path in words', () => {
    expect(designFieldLabel('friction.collar.min')).toBe('Collar friction — lowest friction coefficient of the range');
    expect(designFieldLabel('friction.thread.source.reference')).toBe('Thread friction — friction source reference');
    expect(designFieldLabel('not.a.field')).toBe('not › a › field');
  });
});

describe('designFieldDimension', () => {
  it('reads the dimension a quantity field declares, through optional fields, unions and list elements', () => {
    expect(designFieldDimension('load.axial')).toBe('force');
    expect(designFieldDimension('design.duty.designLife')).toBe('serviceTime');
    expect(designFieldDimension('duty.ambientTemperature')).toBe('temperature');
    expect(designFieldDimension('thread.loadFlankAngle')).toBe('angle'); // a number or a quantity
    expect(designFieldDimension('collar.outerDiameter')).toBe('length'); // inside a discriminated union
    expect(designFieldDimension('nut.allowablePressureBySpeed.0.upToRubbingSpeed')).toBe('linearSpeed');
    expect(designFieldDimension('nut.wearCoefficient.value')).toBe('specificWearRate');
  });

  it('is null for a field that is not a quantity, and for a path that is not a field', () => {
    expect(designFieldDimension('thread.starts')).toBeNull();
    expect(designFieldDimension('friction.thread.min')).toBeNull();
    expect(designFieldDimension('duty.kind')).toBeNull();
    expect(designFieldDimension('not.a.field')).toBeNull();
  });
});

describe('designInputFields', () => {
  it('lists each field as entered with its path and label, list elements numbered by their index', () => {
    const fields = designInputFields({
      thread: { form: 'trapezoidal', size: 'Tr 40x7' },
      load: { axial: '25 kN', sense: 'compression' },
      nut: { length: '60 mm', allowablePressureBySpeed: [{ upToRubbingSpeed: '0.05 m/s', allowablePressure: '17 MPa' }] },
      duty: { kind: 'lifting', brake: false },
    });
    expect(fields).toContainEqual({ path: 'load.axial', label: 'Axial load', value: '25 kN' });
    expect(fields).toContainEqual({ path: 'duty.brake', label: 'Brake fitted', value: 'false' });
    expect(fields).toContainEqual({ path: 'nut.allowablePressureBySpeed.0.allowablePressure', label: 'Allowable mean bearing pressure up to that rubbing speed (step 1)', value: '17 MPa' });
    expect(fields.map((f) => f.path)).toEqual(['thread.form', 'thread.size', 'load.axial', 'load.sense', 'nut.length',
      'nut.allowablePressureBySpeed.0.upToRubbingSpeed', 'nut.allowablePressureBySpeed.0.allowablePressure', 'duty.kind', 'duty.brake']);
  });

  it('gives every field of generated designs a label of its own (a description in the contract), never the path in words', () => {
    checkProperty(
      fc.property(designInputArbitrary, (input) => {
        for (const f of designInputFields(input)) expect({ path: f.path, label: f.label }).toEqual({ path: f.path, label: expect.not.stringContaining('›') });
      }),
      { numRuns: 200 },
    );
  });
});
