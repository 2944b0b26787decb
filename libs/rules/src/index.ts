/**
 * Leadline design rules: versioned thresholds (rule sets) and pure rules that turn a design and its
 * evaluation into findings and a verdict. No I/O, no clock.
 */
export * from './rule-set';
export * from './rule';
export * from './format';
export * from './registry';
export * from './judge';
export * from './check';
export * from './rules/lifting-self-locking.rule';
export * from './rules/screw-body-yield.rule';
export * from './rules/thread-root-yield.rule';
export * from './rules/screw-thread-stripping.rule';
export * from './rules/nut-thread-stripping.rule';
export * from './rules/nut-thread-root-yield.rule';
export * from './rules/column-buckling.rule';
export * from './rules/column-end-fixity.rule';
export * from './rules/shaft-whirl-speed.rule';
export * from './rules/nut-bearing-pressure.rule';
export * from './rules/nut-pv.rule';
export * from './rules/drive-torque-margin.rule';
export * from './rules/friction-source-assumed.rule';
export * from './rules/thread-friction-range.rule';
export * from './rules/nut-engaged-threads.rule';
export * from './rules/brake-holding-torque.rule';
export * from './rules/nut-body-yield.rule';
export * from './rules/nut-body-flange.rule';
export * from './rules/safety-nut-stripping.rule';
export * from './rules/nut-worn-thread-stripping.rule';
export * from './rules/nut-temperature.rule';
export * from './rules/brake-stopping.rule';
export * from './rules/screw-root-fatigue.rule';
export * from './rules/nut-thread-fatigue.rule';
export * from './rules/collar-bearing-pressure.rule';
export * from './rules/collar-bearing-static.rule';
export * from './rules/wear-life-design-life.rule';
export * from './rules/collar-bearing-life.rule';
export * from './rules/engine-not-computed.rule';
export * from './margins';
