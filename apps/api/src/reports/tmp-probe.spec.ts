import { parseDesign } from '@leadline/contracts';
import { evaluate } from '@leadline/mechanics';
it('probe', () => {
  const r = parseDesign({
    thread: { form: 'trapezoidal', size: 'Tr 32x6' },
    load: { axial: '28 kN', sense: 'compression' },
    friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { min: 0.08, max: 0.12, source: { kind: 'test', reference: 'Harrowgate bench test HLS-TR-117' } } },
    collar: { kind: 'annular', outerDiameter: '60 mm', innerDiameter: '34 mm', model: 'uniform-wear' },
    nut: { length: '48 mm', material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '1100 mm', ends: 'fixed-pinned' },
    duty: { kind: 'lifting', speed: '90 rpm', brake: false },
    drive: { availableTorque: '140 N*m' },
  });
  if (!r.success) throw new Error(JSON.stringify(r.issues));
  const e = evaluate(r.design);
  const { trace, ...rest } = e;
  console.log(JSON.stringify(rest, null, 1));
  console.log(JSON.stringify(r.design));
});
