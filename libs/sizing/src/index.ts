/**
 * Leadline screw selection: searches the standard size tables for the screws that pass a rule set, ranked by an
 * objective, with the rules that stopped the rest. Pure (no I/O, no clock).
 */
export * from './checks';
export * from './request';
export * from './search';
