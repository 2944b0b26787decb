/**
 * ISO general-purpose metric screw threads, coarse series M6 to M64: nominal diameter and coarse pitch
 * per ISO 261:1998 Table 1 (from memory; the pitches agree with the ISO 898-1 stress-area table and with
 * J. H. Bickford, Introduction to the Design and Behavior of Bolted Joints, 4th ed.).
 */
export interface MetricSize {
  /** Nominal (major) diameter [mm] */
  readonly d: number;
  /** Coarse pitch [mm] */
  readonly P: number;
}

export const ISO_METRIC_COARSE: readonly MetricSize[] = [
  { d: 6, P: 1 }, { d: 8, P: 1.25 }, { d: 10, P: 1.5 }, { d: 12, P: 1.75 }, { d: 14, P: 2 },
  { d: 16, P: 2 }, { d: 18, P: 2.5 }, { d: 20, P: 2.5 }, { d: 22, P: 2.5 }, { d: 24, P: 3 },
  { d: 27, P: 3 }, { d: 30, P: 3.5 }, { d: 33, P: 3.5 }, { d: 36, P: 4 }, { d: 39, P: 4 },
  { d: 42, P: 4.5 }, { d: 45, P: 4.5 }, { d: 48, P: 5 }, { d: 52, P: 5 }, { d: 56, P: 5.5 },
  { d: 60, P: 5.5 }, { d: 64, P: 6 },
];
