import { designFieldDimension, designFieldLabel } from './design-input';

describe('designFieldLabel', () => {
  it('names a field by the contract\'s description of it', () => {
    expect(designFieldLabel('load.axial')).toBe('Axial load');
    expect(designFieldLabel('design.nut.length')).toBe('Nut length');
    expect(designFieldLabel('collar.outerDiameter')).toBe('Collar outer diameter'); // inside a discriminated union
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
