/**
 * The shared contract examples (shared/contract/examples.json) were computed from the first engine issue's conventions.
 * Used by the unit replay (libs/mechanics/src/contract-examples.spec.ts) and the HTTP run of the shared checker
 * (test/e2e/service.e2e-spec.ts): both accept exactly these differences, each at its engine 1.2 value.
 *
 * Fields engine 1.2 changes on purpose (docs/formulas.md, "Engine 1.2"), with the value each now takes. Computed
 * independently of the engine (a short Python script, double precision) from the published formulas cited:
 * - whirl mass on the pitch diameter, stiffness on the root: n_c = (beta_1 L)^2 (60 / 2 pi) d_r^2 / (4 d_m L^2) sqrt(E / rho)
 *   (Thomson, Sec. 9.5): the contract's root-only value x d_r / d_m for Tr 32x6 (25 / 29);
 * - an Acme screw without a class on the root every ASME B1.5 class shares, d_r = d - p - 0.020 in = 1.03 in
 *   (threads.md Sec. 2.1, from memory): axial 4F / (pi d_r^2), torsion 16 T / (pi d_r^3) (Shigley 10th ed., Eqs. (8-7), (8-8)),
 *   l/k = 28 / (1.03 / 4) = 108.74, above the transition 107.00, so Euler P_cr = pi^2 E A / (l/k)^2 (Shigley 9th ed., Eq. (4-43)),
 *   and n_c with d_r = 1.03 in, d_m = 1.15 in.
 * The shared examples file still holds the earlier values; the service's answers differ from it in exactly these fields.
 */
export const ENGINE_1_2_CHANGES: Readonly<Record<string, Readonly<Record<string, number | string>>>> = {
  'trapezoidal-jack-SI': { 'criticalSpeed.rpm': 10271.68920997522 },
  'trapezoidal-3-start-lift-SI': { 'criticalSpeed.rpm': 10271.68920997522 },
  'acme-positioning-US': {
    'stresses.body.axial': -28961609.69888391,
    'stresses.body.torsion': 32635904.769040246,
    'stresses.body.vonMises': 63514421.013121724,
    'buckling.slenderness': 108.73786407766988,
    'buckling.regime': 'euler',
    'buckling.criticalLoad': 89719.51025599438,
    'criticalSpeed.rpm': 5514.687953997132,
  },
};

