/**
 * Shared assertion for the engine's specs: relative closeness, with the tolerance named at each call so
 * that it can be matched to the rounding of the source being replayed.
 *
 * Deliberately free of jest imports, so that it type-checks in the production build (tsconfig.build.json
 * compiles every non-spec file) and can be used from any test runner. Never imported by engine code.
 */

export interface CloseOptions {
  /** Relative tolerance: |actual - expected| <= rtol |expected| [-] */
  readonly rtol: number;
  /** Absolute tolerance added to the relative one, for expected values at or near zero (default 0) */
  readonly atol?: number;
  /** What is being compared, printed on failure */
  readonly label?: string;
}

/**
 * Throws unless `actual` is within `rtol` (relative to `expected`) plus `atol` of `expected`.
 * NaN and infinities never pass, so a formula that blows up cannot slip through a tolerance.
 */
export function expectClose(actual: number, expected: number, { rtol, atol = 0, label }: CloseOptions): void {
  if (!(rtol >= 0) || !(atol >= 0)) throw new Error(`expectClose: tolerances must be non-negative (rtol ${rtol}, atol ${atol})`);
  if (!Number.isFinite(expected)) throw new Error(`expectClose: expected value must be finite, got ${expected}`);
  const what = label ? `${label}: ` : '';
  if (typeof actual !== 'number' || !Number.isFinite(actual)) {
    throw new Error(`${what}expected a finite number close to ${expected}, got ${String(actual)}`);
  }
  const error = Math.abs(actual - expected);
  const allowed = rtol * Math.abs(expected) + atol;
  if (!(error <= allowed)) {
    const relative = expected === 0 ? Infinity : error / Math.abs(expected);
    throw new Error(
      `${what}expected ${actual} to be within rtol ${rtol}${atol ? ` + atol ${atol}` : ''} of ${expected} ` +
        `(absolute error ${error}, relative error ${relative})`,
    );
  }
}
