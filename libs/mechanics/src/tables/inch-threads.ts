/**
 * Inch thread size series. Diameters in inches, threads per inch (TPI); basic dimensions are not stored,
 * they follow from each standard's basic-profile relations (see ../threads.ts).
 */
export interface InchSize {
  /** Nominal size as the standard writes it, e.g. "1-1/2" */
  readonly nominal: string;
  /** Major diameter [in] */
  readonly d: number;
  /** Threads per inch */
  readonly tpi: number;
}

/**
 * ASME B1.5 general-purpose Acme threads, preferred diameter-pitch series 1/4-16 to 5-2
 * (ASME B1.5-1997 Table 1, from memory; matches the basic sizes used by Shigley's Mechanical
 * Engineering Design, 10th ed., Table 8-3 "Preferred pitches for Acme threads", from memory).
 */
export const ACME_PREFERRED: readonly InchSize[] = [
  { nominal: '1/4', d: 0.25, tpi: 16 },
  { nominal: '5/16', d: 0.3125, tpi: 14 },
  { nominal: '3/8', d: 0.375, tpi: 12 },
  { nominal: '7/16', d: 0.4375, tpi: 12 },
  { nominal: '1/2', d: 0.5, tpi: 10 },
  { nominal: '5/8', d: 0.625, tpi: 8 },
  { nominal: '3/4', d: 0.75, tpi: 6 },
  { nominal: '7/8', d: 0.875, tpi: 6 },
  { nominal: '1', d: 1, tpi: 5 },
  { nominal: '1-1/8', d: 1.125, tpi: 5 },
  { nominal: '1-1/4', d: 1.25, tpi: 5 },
  { nominal: '1-3/8', d: 1.375, tpi: 4 },
  { nominal: '1-1/2', d: 1.5, tpi: 4 },
  { nominal: '1-3/4', d: 1.75, tpi: 4 },
  { nominal: '2', d: 2, tpi: 4 },
  { nominal: '2-1/4', d: 2.25, tpi: 3 },
  { nominal: '2-1/2', d: 2.5, tpi: 3 },
  { nominal: '2-3/4', d: 2.75, tpi: 3 },
  { nominal: '3', d: 3, tpi: 2 },
  { nominal: '3-1/2', d: 3.5, tpi: 2 },
  { nominal: '4', d: 4, tpi: 2 },
  { nominal: '4-1/2', d: 4.5, tpi: 2 },
  { nominal: '5', d: 5, tpi: 2 },
];

/**
 * ASME B1.8 stub Acme threads: the same preferred diameter-pitch series as B1.5 (ASME B1.8, from memory).
 */
export const STUB_ACME_PREFERRED: readonly InchSize[] = ACME_PREFERRED;

/**
 * Unified coarse (UNC) threads 1/4-20 to 2-4.5, ASME B1.1 Table 2 series (from memory; the same
 * series is printed in Shigley's Mechanical Engineering Design, 10th ed., Table 8-2).
 */
export const UNIFIED_COARSE: readonly InchSize[] = [
  { nominal: '1/4', d: 0.25, tpi: 20 },
  { nominal: '5/16', d: 0.3125, tpi: 18 },
  { nominal: '3/8', d: 0.375, tpi: 16 },
  { nominal: '7/16', d: 0.4375, tpi: 14 },
  { nominal: '1/2', d: 0.5, tpi: 13 },
  { nominal: '9/16', d: 0.5625, tpi: 12 },
  { nominal: '5/8', d: 0.625, tpi: 11 },
  { nominal: '3/4', d: 0.75, tpi: 10 },
  { nominal: '7/8', d: 0.875, tpi: 9 },
  { nominal: '1', d: 1, tpi: 8 },
  { nominal: '1-1/8', d: 1.125, tpi: 7 },
  { nominal: '1-1/4', d: 1.25, tpi: 7 },
  { nominal: '1-3/8', d: 1.375, tpi: 6 },
  { nominal: '1-1/2', d: 1.5, tpi: 6 },
  { nominal: '1-3/4', d: 1.75, tpi: 5 },
  { nominal: '2', d: 2, tpi: 4.5 },
];
