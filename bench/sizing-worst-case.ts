/**
 * The costliest screw search the API accepts: every thread form, every number of starts (1 to 12), twelve nut
 * lengths, 500 listed, and requirements so light (an invented 1 kN jack over 100 mm) that almost no screw is
 * pruned, so nearly every size x starts x nut length is evaluated. Used by the benchmark (/health latency while it
 * runs) and by test/hardening/search-responsiveness.
 */
export const WORST_CASE_SIZING = {
  requirements: {
    load: { axial: '1 kN', sense: 'compression' },
    duty: { kind: 'positioning', speed: '10 rpm', brake: false },
    friction: { thread: { entry: 'thread/steel-bronze/oil' }, collar: { entry: 'collar/hard-steel-bronze' } },
    collar: { kind: 'plain', meanDiameterRatio: 1.6 },
    nut: { material: 'bronze' },
    screw: { material: 'steel-1045-cd', unsupportedLength: '100 mm', ends: 'fixed-free' },
  },
  search: {
    forms: ['trapezoidal', 'acme', 'stub-acme', 'iso-metric', 'unified'],
    starts: [1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12],
    nutLength: { ratios: [0.5, 0.75, 1, 1.25, 1.5, 2, 2.5, 3, 4, 5, 7.5, 10] },
    limit: 500,
  },
};
