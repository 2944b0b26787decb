/**
 * The invented demo scenario: Corrin Vale Lifting Ltd (a fictional company) and its lift-table family.
 * Values are plausible but invented for demonstration; they are not check data.
 */
import type { DesignInput } from '@leadline/contracts';
import { MAIN_LIFT_SCREW_ENGINE_1_0_0 } from './recorded-history';

const bronzeOil = { entry: 'thread/steel-bronze/oil' };
const collarSteelBronze = { entry: 'collar/soft-steel-bronze' };

/** Main lift screw of the CV-400 scissor table: Tr 40x7, single start, bronze nut. Passes. */
export const liftScrew: DesignInput = {
  thread: { form: 'trapezoidal', size: 'Tr 40x7', starts: 1 },
  load: { axial: '18 kN', sense: 'compression' },
  friction: { thread: bronzeOil, collar: collarSteelBronze },
  collar: { kind: 'annular', outerDiameter: '70 mm', innerDiameter: '42 mm', model: 'uniform-wear' },
  nut: { length: '60 mm', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '520 mm', ends: 'fixed-pinned' },
  duty: { kind: 'lifting', speed: '60 rpm', brake: true, vibration: false },
  drive: { availableTorque: '220 N*m' },
};

/** Platform tilt screw: Tr 24x5 on positioning duty. Passes. */
export const tiltScrew: DesignInput = {
  thread: { form: 'trapezoidal', size: 'Tr 24x5' },
  load: { axial: '4.5 kN', sense: 'tension' },
  friction: { thread: bronzeOil, collar: { min: 0.002, max: 0.005, source: { kind: 'supplier', reference: 'thrust ball bearing catalogue friction coefficient (demo)' } } },
  collar: { kind: 'rolling', meanDiameter: '32 mm' },
  nut: { length: '40 mm', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '300 mm', ends: 'pinned-pinned' },
  duty: { kind: 'positioning', speed: '90 rpm', brake: false },
  drive: { availableTorque: '30 N*m' },
};

/** Fast-lift variant: a two-start Tr 32x6 on lifting duty with no brake. It does not self-lock: blocked. */
export const fastLiftScrew: DesignInput = {
  thread: { form: 'trapezoidal', majorDiameter: '32 mm', pitch: '6 mm', starts: 2 },
  load: { axial: '9 kN', sense: 'compression' },
  friction: { thread: { min: 0.08, max: 0.14, source: { kind: 'assumed', reference: 'designer estimate, grease-lubricated (demo)' } }, collar: collarSteelBronze },
  collar: { kind: 'plain', meanDiameter: '48 mm' },
  nut: { length: '48 mm', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '450 mm', ends: 'fixed-free' },
  duty: { kind: 'lifting', speed: '120 rpm', brake: false, vibration: false },
  drive: { availableTorque: '90 N*m' },
};

/** Workshop press screw in US customary units: 1-1/2-4 Acme. */
export const pressScrew: DesignInput = {
  thread: { form: 'acme', size: '1-1/2-4 ACME' },
  load: { axial: '6000 lbf', sense: 'compression' },
  friction: { thread: { entry: 'thread/steel-bronze/dry' }, collar: { entry: 'collar/hard-steel-bronze' } },
  collar: { kind: 'plain', meanDiameter: '2.25 in' },
  nut: { length: '2.5 in', material: 'bronze' },
  screw: { material: 'steel-1045-cd', unsupportedLength: '14 in', ends: 'fixed-pinned' },
  duty: { kind: 'clamping', speed: '20 rpm', brake: false },
  drive: { availableTorque: '2400 lbf*in' },
};

export const DEMO_PRODUCTS = [
  {
    product: { code: 'CV-400', name: 'CV-400 scissor lift table', description: 'Fictional demo product of Corrin Vale Lifting Ltd: 1.8 t scissor lift table.' },
    calculations: [
      // Approved before the corrections of rule set 2026.12-2: stored as judged then (engine 1.0.0, rule set 2026.12-1), see recorded-history.ts
      { title: 'Main lift screw', design: liftScrew, review: 'approve' as const, recorded: MAIN_LIFT_SCREW_ENGINE_1_0_0 },
      { title: 'Platform tilt screw', design: tiltScrew, review: null },
      { title: 'Fast-lift screw (proposal)', design: fastLiftScrew, review: 'reject' as const },
    ],
  },
  {
    product: { code: 'CV-P60', name: 'CV-P60 workshop press', description: 'Fictional demo product of Corrin Vale Lifting Ltd: 3 ton hand press.' },
    calculations: [{ title: 'Press screw', design: pressScrew, review: null }],
  },
];
