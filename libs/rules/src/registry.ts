/**
 * The one list of design rules. Order is the order findings are reported in; append new rules,
 * and never reuse an id for a different check (acknowledgements name findings by rule id).
 */
import type { CheckDeclaration } from './check';
import type { Rule, RuleSummary } from './rule';
import { columnBucklingRule } from './rules/column-buckling.rule';
import { columnEndFixityRule } from './rules/column-end-fixity.rule';
import { driveTorqueMarginRule } from './rules/drive-torque-margin.rule';
import { frictionSourceAssumedRule } from './rules/friction-source-assumed.rule';
import { liftingSelfLockingRule } from './rules/lifting-self-locking.rule';
import { nutBearingPressureRule } from './rules/nut-bearing-pressure.rule';
import { nutEngagedThreadsRule } from './rules/nut-engaged-threads.rule';
import { nutPvRule } from './rules/nut-pv.rule';
import { nutThreadRootYieldRule } from './rules/nut-thread-root-yield.rule';
import { nutThreadStrippingRule } from './rules/nut-thread-stripping.rule';
import { screwBodyYieldRule } from './rules/screw-body-yield.rule';
import { screwThreadStrippingRule } from './rules/screw-thread-stripping.rule';
import { shaftWhirlSpeedRule } from './rules/shaft-whirl-speed.rule';
import { threadFrictionRangeRule } from './rules/thread-friction-range.rule';
import { threadRootYieldRule } from './rules/thread-root-yield.rule';
import { brakeHoldingTorqueRule } from './rules/brake-holding-torque.rule';
import { nutBodyYieldRule } from './rules/nut-body-yield.rule';
import { nutBodyFlangeRule } from './rules/nut-body-flange.rule';
import { safetyNutStrippingRule } from './rules/safety-nut-stripping.rule';
import { nutWornThreadStrippingRule } from './rules/nut-worn-thread-stripping.rule';
import { nutTemperatureRule } from './rules/nut-temperature.rule';
import { brakeStoppingRule } from './rules/brake-stopping.rule';
import { screwRootFatigueRule } from './rules/screw-root-fatigue.rule';
import { nutThreadFatigueRule } from './rules/nut-thread-fatigue.rule';
import { collarBearingPressureRule } from './rules/collar-bearing-pressure.rule';
import { collarBearingStaticRule } from './rules/collar-bearing-static.rule';
import { collarBearingLifeRule } from './rules/collar-bearing-life.rule';
import { wearLifeDesignLifeRule } from './rules/wear-life-design-life.rule';
import { engineNotComputedRule } from './rules/engine-not-computed.rule';

export const RULE_REGISTRY: readonly Rule[] = Object.freeze([
  liftingSelfLockingRule,
  screwBodyYieldRule,
  threadRootYieldRule,
  screwThreadStrippingRule,
  nutThreadStrippingRule,
  nutThreadRootYieldRule,
  columnBucklingRule,
  columnEndFixityRule,
  shaftWhirlSpeedRule,
  nutBearingPressureRule,
  nutPvRule,
  driveTorqueMarginRule,
  frictionSourceAssumedRule,
  threadFrictionRangeRule,
  nutEngagedThreadsRule,
  brakeHoldingTorqueRule,
  nutBodyYieldRule,
  nutBodyFlangeRule,
  safetyNutStrippingRule,
  nutWornThreadStrippingRule,
  nutTemperatureRule,
  brakeStoppingRule,
  screwRootFatigueRule,
  nutThreadFatigueRule,
  collarBearingPressureRule,
  collarBearingStaticRule,
  wearLifeDesignLifeRule,
  collarBearingLifeRule,
  engineNotComputedRule,
]);

/** Every numeric check the rules declare, in registry order: the one list the API, search, re-check and report read. */
export const CHECK_DECLARATIONS: readonly CheckDeclaration[] = Object.freeze(RULE_REGISTRY.flatMap((r) => r.checks ?? []));

/** Rules whose finding does not depend on the nut length (Rule.nutIndependent): the screw search prunes on them. */
export const NUT_INDEPENDENT_RULES: ReadonlySet<string> = new Set(RULE_REGISTRY.filter((r) => r.nutIndependent === true).map((r) => r.id));

/** Checks whose value does not change with the axial load (CheckDeclaration.loadIndependent). */
/** A declared check's label by its id (the id itself for one no declaration has, e.g. of a later rule set). */
export function checkLabel(id: string): string {
  return CHECK_DECLARATIONS.find((d) => d.id === id)?.label ?? id;
}

export const LOAD_INDEPENDENT_CHECKS: ReadonlySet<string> = new Set(CHECK_DECLARATIONS.filter((d) => d.loadIndependent === true).map((d) => d.id));

/** The rules as the API lists them: id, title, basis, description. */
export const RULES: readonly RuleSummary[] = Object.freeze(
  RULE_REGISTRY.map(({ id, title, basis, description }) => Object.freeze({ id, title, basis, description })),
);

/** Looks up a registered rule by id. */
export function findRule(id: string): Rule | undefined {
  return RULE_REGISTRY.find((r) => r.id === id);
}
