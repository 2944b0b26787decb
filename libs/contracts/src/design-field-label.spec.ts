import { designFieldLabel } from './design-input';

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
