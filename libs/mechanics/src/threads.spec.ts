/**
 * Standard thread tables: basic dimensions of each form replayed from the shared reference data
 * (copied into the tables below so that the suite needs nothing outside the repository), and designation lookup.
 *
 * Provenance (as the reference labels it): the thread standards themselves are paywalled and were not read.
 * The basic-profile relations are recalled (from memory); the tabulated values are computed from them and
 * rounded half-up, and were cross-checked against public sources where one exists (threadlib TR.csv for
 * ISO trapezoidal; the ISO 898-1 stress-area table and Bickford for ISO metric).
 */
import { leadAngle } from './mechanics';
import { expectClose } from './test-support';
import { ISO_TRAPEZOIDAL_SIZES } from './tables/iso-trapezoidal';
import { findThreadSize, INCH, MM, THREAD_SIZES, threadGeometry, trapezoidalCrestClearance, type ThreadForm } from './threads';

const DEG = Math.PI / 180;

/** Half a unit in the last printed place, plus float slack: the tables are rounded half-up. */
const halfUnit = (decimals: number): number => 0.5 * 10 ** -decimals * (1 + 1e-9);

function geometryOf(designation: string, form: ThreadForm) {
  const size = findThreadSize(designation);
  if (!size) throw new Error(`size ${designation} not shipped`);
  expect(size.form).toBe(form);
  return threadGeometry({ form, majorDiameter: size.majorDiameter, pitch: size.pitch, starts: 1 });
}

describe('ISO 2904 basic dimensions of metric trapezoidal threads (ISO 2901 basic profile)', () => {
  // Source: ISO 2904 Table 1 / ISO 2901 relations, values from shared reference threads.md §1.2 (computed from the
  // ISO 2901 relations, which are from memory, and cross-checked against the open dataset adrianschlatter/threadlib,
  // design/TR.csv, commit 1b7dcf6e). ISO 2904 prints three decimals, so the tolerance is half a unit of 0.001 mm.
  // Columns: d, P, ac, H1, h3, d2, d3, D1, D4 [mm]
  const rows: ReadonlyArray<readonly [string, number, number, number, number, number, number, number, number, number]> = [
    ['Tr 8x1.5', 8, 1.5, 0.15, 0.75, 0.9, 7.25, 6.2, 6.5, 8.3], // ac band P = 1.5
    ['Tr 10x2', 10, 2, 0.25, 1.0, 1.25, 9.0, 7.5, 8.0, 10.5], // ac band 2..5, lower end
    ['Tr 24x5', 24, 5, 0.25, 2.5, 2.75, 21.5, 18.5, 19.0, 24.5], // ac band 2..5, upper end
    ['Tr 30x6', 30, 6, 0.5, 3.0, 3.5, 27.0, 23.0, 24.0, 31.0], // ac band 6..12, lower end
    ['Tr 40x7', 40, 7, 0.5, 3.5, 4.0, 36.5, 32.0, 33.0, 41.0], // the reference's worked check (§1.2, §6)
    ['Tr 44x12', 44, 12, 0.5, 6.0, 6.5, 38.0, 31.0, 32.0, 45.0], // ac band 6..12, upper end
    ['Tr 55x14', 55, 14, 1, 7.0, 8.0, 48.0, 39.0, 41.0, 57.0], // ac band 14..44, lower end
    ['Tr 120x22', 120, 22, 1, 11.0, 12.0, 109.0, 96.0, 98.0, 122.0], // ac band 14..44, largest shipped
    // threadlib TR.csv prints d3 13.5 / D4 22.5 here (ac = 0.25); ISO 2901 gives ac = 0.5 for P = 8 (threads.md §7),
    // and the engine follows the standard's relation, not the dataset's misprint.
    ['Tr 22x8', 22, 8, 0.5, 4.0, 4.5, 18.0, 13.0, 14.0, 23.0],
  ];

  it.each(rows)('%s: ac, H1, h3, d2, d3, D1, D4 match ISO 2904 (reference §1.2)', (designation, d, P, ac, H1, h3, d2, d3, D1, D4) => {
    const g = geometryOf(designation, 'trapezoidal');
    const tol = { rtol: 0, atol: halfUnit(3) };
    const mm = (x: number) => x / MM;
    expectClose(mm(g.majorDiameter), d, { ...tol, label: 'd' });
    expectClose(mm(g.pitch), P, { ...tol, label: 'P' });
    expectClose(mm(g.crestClearance), ac, { ...tol, label: 'ac' });
    expectClose(mm(g.threadHeight), H1, { ...tol, label: 'H1' }); // engine: threadHeight = H1, the flank overlap
    expectClose(mm(g.majorDiameter - g.minorDiameter) / 2, h3, { ...tol, label: 'h3' }); // h3 = (d - d3)/2
    expectClose(mm(g.meanDiameter), d2, { ...tol, label: 'd2' });
    expectClose(mm(g.minorDiameter), d3, { ...tol, label: 'd3' });
    expectClose(mm(g.majorDiameter - 2 * g.threadHeight), D1, { ...tol, label: 'D1' }); // D1 = d - 2 H1 = d - P
    expectClose(mm(g.nutMajorDiameter), D4, { ...tol, label: 'D4' });
    expect(g.flankAngle).toBe(15); // 30 deg included angle, ISO 2901
  });

  it('ISO 2901 crest clearance bands (from memory, reference §1.1): 1.5 -> 0.15; 2..5 -> 0.25; 6..12 -> 0.5; 14..44 -> 1', () => {
    const bands: Array<[number, number]> = [[1.5, 0.15], [2, 0.25], [3, 0.25], [5, 0.25], [6, 0.5], [10, 0.5], [12, 0.5], [14, 1], [22, 1], [44, 1]];
    for (const [P, ac] of bands) expect([P, trapezoidalCrestClearance(P)]).toEqual([P, ac]);
  });

  it('ships exactly the (d, P) list of the reference table, Tr 8x1.5 to Tr 120x22 (threadlib TR.csv; first choice from memory of ISO 2902)', () => {
    // d:P, with "*" marking the first-choice pitch (threads.md §1.2 "first choice" column).
    const reference =
      '8:1.5* 9:1.5 9:2* 10:1.5 10:2* 11:2* 11:3 12:2 12:3* 14:2 14:3* 16:2 16:3 16:4* 18:2 18:3 18:4* 20:2 20:3 20:4* ' +
      '22:3 22:5* 22:8 24:3 24:5* 24:8 26:3 26:5* 26:8 28:3 28:5* 28:8 30:3 30:6* 30:10 32:3 32:6* 32:10 34:3 34:6* 34:10 ' +
      '36:3 36:6* 36:10 38:3 38:7* 38:10 40:3 40:7* 40:10 42:3 42:7* 42:10 44:3 44:7* 44:12 46:3 46:8* 46:12 48:3 48:8* 48:12 ' +
      '50:3 50:8* 50:12 52:3 52:8* 52:12 55:3 55:9* 55:14 60:3 60:9* 60:14 65:4 65:10* 65:16 70:4 70:10* 70:16 75:4 75:10* 75:16 ' +
      '80:4 80:10* 80:16 85:4 85:12* 85:18 90:4 90:12* 90:18 95:4 95:12* 95:18 100:4 100:12* 100:20 105:4 105:12* 105:20 ' +
      '110:4 110:12* 110:20 115:6 115:12 115:14* 115:22 120:6 120:12 120:14* 120:22';
    const shipped = ISO_TRAPEZOIDAL_SIZES.map((s) => `${s.d}:${s.P}${s.preferred ? '*' : ''}`).join(' ');
    expect(shipped).toBe(reference);
  });
});

describe('ASME B1.5 general-purpose Acme, basic dimensions (reference threads.md §2.2)', () => {
  // Source: ASME B1.5 basic relations E = d - p/2, K = d - p (from memory), preferred series from memory of
  // ASME B1.5 Table 1; values computed in the shared reference and printed to 4 decimals [in] and 3 decimals [deg].
  // Columns: designation, basic d2 [in], basic minor [in], lead angle at basic d2, single start [deg]
  const rows: ReadonlyArray<readonly [string, number, number, number]> = [
    ['1/4-16 ACME', 0.2188, 0.1875, 5.197],
    ['1/2-10 ACME', 0.45, 0.4, 4.046],
    ['3/4-6 ACME', 0.6667, 0.5833, 4.55],
    ['1-5 ACME', 0.9, 0.8, 4.046],
    ['1-1/2-4 ACME', 1.375, 1.25, 3.312],
    ['2-4 ACME', 1.875, 1.75, 2.43],
    ['2-1/2-3 ACME', 2.3333, 2.1667, 2.604],
    ['3-2 ACME', 2.75, 2.5, 3.312],
    ['5-2 ACME', 4.75, 4.5, 1.919],
  ];

  it.each(rows)('%s: basic pitch diameter, basic minor diameter, lead angle', (designation, d2, minor, lambdaDeg) => {
    const g = geometryOf(designation, 'acme');
    expectClose(g.meanDiameter / INCH, d2, { rtol: 0, atol: halfUnit(4), label: 'basic d2' });
    expectClose(g.minorDiameter / INCH, minor, { rtol: 0, atol: halfUnit(4), label: 'basic minor' });
    expectClose(g.threadHeight / INCH, g.pitch / INCH / 2, { rtol: 1e-12, label: 'h = p/2' });
    expectClose(leadAngle(g.lead, g.meanDiameter) / DEG, lambdaDeg, { rtol: 0, atol: halfUnit(3), label: 'lead angle' });
    expect(g.flankAngle).toBe(14.5); // 29 deg included angle
  });
});

describe('ASME B1.8 stub Acme, basic dimensions (from memory of ASME B1.8; reference threads.md §3, computed, not cross-checked)', () => {
  // Columns: designation, basic height 0.3p [in] (5 decimals), basic d2 = d - 0.3p [in], basic minor d - 0.6p [in] (4 decimals)
  const rows: ReadonlyArray<readonly [string, number, number, number]> = [
    ['1/4-16 STUB ACME', 0.01875, 0.2313, 0.2125],
    ['5/16-14 STUB ACME', 0.02143, 0.2911, 0.2696],
    ['1/2-10 STUB ACME', 0.03, 0.47, 0.44],
    ['1-5 STUB ACME', 0.06, 0.94, 0.88],
    ['1-1/2-4 STUB ACME', 0.075, 1.425, 1.35],
    ['2-1/4-3 STUB ACME', 0.1, 2.15, 2.05],
    ['5-2 STUB ACME', 0.15, 4.85, 4.7],
  ];

  it.each(rows)('%s: basic height, pitch diameter, minor diameter', (designation, h, d2, minor) => {
    const g = geometryOf(designation, 'stub-acme');
    expectClose(g.threadHeight / INCH, h, { rtol: 0, atol: halfUnit(5), label: 'basic height' });
    expectClose(g.meanDiameter / INCH, d2, { rtol: 0, atol: halfUnit(4), label: 'basic d2' });
    expectClose(g.minorDiameter / INCH, minor, { rtol: 0, atol: halfUnit(4), label: 'basic minor' });
  });
});

describe('ISO 68-1 metric coarse threads (ISO 724 / ISO 898-1 relations; reference threads.md §4)', () => {
  // d2 = d - 0.649519P, D1 = d - 1.082532P, d3 = d - 1.226869P (ISO 724 / ISO 898-1), printed to 3 decimals [mm].
  // As,nom: public source, the ISO 898-1 coarse-thread stress-area table (3 significant figures) as reproduced in
  // threads.md §4; Bickford, Introduction to the Design and Behavior of Bolted Joints, 4th ed., for M42 and M64.
  // Columns: designation, d2, D1, d3 [mm], As published [mm^2], its rounding (absolute)
  const rows: ReadonlyArray<readonly [string, number, number, number, number, number]> = [
    ['M6', 5.35, 4.917, 4.773, 20.1, 0.05],
    ['M10', 9.026, 8.376, 8.16, 58.0, 0.05],
    ['M20', 18.376, 17.294, 16.933, 245, 0.5],
    ['M24', 22.051, 20.752, 20.319, 353, 0.5],
    ['M36', 33.402, 31.67, 31.093, 817, 0.5],
    ['M42', 39.077, 37.129, 36.479, 1120.9, 0.05],
    ['M64', 60.103, 57.505, 56.639, 2676.0, 0.05],
  ];

  it.each(rows)('%s: d2, D1, d3, and the stress area built from them matches the published As', (designation, d2, D1, d3, As, asRounding) => {
    const g = geometryOf(designation, 'iso-metric');
    const mm = (x: number) => x / MM;
    expectClose(mm(g.meanDiameter), d2, { rtol: 0, atol: halfUnit(3), label: 'd2' });
    // D1 = d - 2 x 5H/8: the engine's threadHeight is the basic flank overlap 5H/8 = 0.541266P
    expectClose(mm(g.majorDiameter - 2 * g.threadHeight), D1, { rtol: 0, atol: halfUnit(3), label: 'D1' });
    expectClose(mm(g.minorDiameter), d3, { rtol: 0, atol: halfUnit(3), label: 'd3' });
    const stressArea = (Math.PI / 4) * ((mm(g.meanDiameter) + mm(g.minorDiameter)) / 2) ** 2;
    expectClose(stressArea, As, { rtol: 0, atol: asRounding * (1 + 1e-9), label: 'As' });
    expect(g.flankAngle).toBe(30);
  });
});

describe('ASME B1.1 unified coarse threads (reference threads.md §5, computed from the B1.1 relations)', () => {
  // basic PD = d - 0.649519/n, D1 = d - 1.082532/n (ASME B1.1 basic relations), printed to 4 decimals [in]
  const rows: ReadonlyArray<readonly [string, number, number]> = [
    ['1/4-20 UNC', 0.2175, 0.1959],
    ['1/2-13 UNC', 0.45, 0.4167],
    ['3/4-10 UNC', 0.685, 0.6417],
    ['1-8 UNC', 0.9188, 0.8647],
    ['1-1/2-6 UNC', 1.3917, 1.3196],
    ['2-4.5 UNC', 1.8557, 1.7594],
  ];

  it.each(rows)('%s: basic pitch diameter and internal minor diameter', (designation, pd, D1) => {
    const g = geometryOf(designation, 'unified');
    expectClose(g.meanDiameter / INCH, pd, { rtol: 0, atol: halfUnit(4), label: 'basic PD' });
    expectClose((g.majorDiameter - 2 * g.threadHeight) / INCH, D1, { rtol: 0, atol: halfUnit(4), label: 'D1' });
  });
});

describe('designation lookup', () => {
  it('every shipped size resolves to itself by its own designation, in any letter case', () => {
    expect(THREAD_SIZES.length).toBe(112 + 23 + 23 + 22 + 16);
    for (const size of THREAD_SIZES) {
      expect(findThreadSize(size.designation)).toBe(size);
      expect(findThreadSize(size.designation.toLowerCase())).toBe(size);
      expect(findThreadSize(`  ${size.designation} `)).toBe(size);
    }
  });

  it.each([
    ['Tr 24x5', 'Tr 24x5'],
    ['TR24X5', 'Tr 24x5'],
    ['tr 24 x 5', 'Tr 24x5'],
    ['Tr24x5', 'Tr 24x5'],
    ['1-1/2-4 ACME', '1-1/2-4 ACME'],
    ['1 1/2-4 acme', '1-1/2-4 ACME'],
    ['1 1/2-4 stub acme', '1-1/2-4 STUB ACME'],
    ['M20', 'M20'],
    ['m 20', 'M20'],
    ['M20x2.5', 'M20'],
    ['1/2-13 UNC', '1/2-13 UNC'],
    ['1/2-13 unc', '1/2-13 UNC'],
  ])('"%s" resolves to %s', (text, designation) => {
    expect(findThreadSize(text)?.designation).toBe(designation);
  });

  it.each(['Tr 24x6', 'Tr 23x5', 'M21', 'M20x1.5', '1-1/2-5 ACME', '1/2-20 UNC', '', 'ACME'])('"%s" is not a shipped size', (text) => {
    expect(findThreadSize(text)).toBeUndefined();
  });

  it('converts inch sizes exactly (1 in = 25.4 mm, NIST SP 811 B.8): 1-1/2-4 ACME is d = 38.1 mm, p = 6.35 mm', () => {
    const size = findThreadSize('1-1/2-4 ACME');
    expectClose(size?.majorDiameter ?? NaN, 0.0381, { rtol: 1e-15 });
    expectClose(size?.pitch ?? NaN, 0.00635, { rtol: 1e-15 });
  });
});
