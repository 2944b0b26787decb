/**
 * Demo history: the main lift screw as it was judged and approved before the corrections of rule set 2026.12-2. This record was
 * produced by running engine 1.0.0 and rule set 2026.12-1 exactly as they stood at commit 2da797f on the demo design
 * `liftScrew` (demo-designs.ts); the seed stores it as that revision's evaluation, so the demo shows one approved
 * revision that the corrected checks now flag (POST /api/v1/rule-sets/recheck). Invented demo data, not check data.
 */
import type { Finding, Verdict } from '@leadline/contracts';

export interface RecordedAssessment {
  readonly engineVersion: string;
  readonly ruleSetVersion: string;
  readonly input: unknown;
  readonly normalized: unknown;
  readonly evaluation: unknown;
  readonly findings: readonly Finding[];
  readonly verdict: Verdict;
}

export const MAIN_LIFT_SCREW_ENGINE_1_0_0: RecordedAssessment = {
  "engineVersion": "1.0.0",
  "ruleSetVersion": "2026.12-1",
  "input": {
    "thread": {
      "form": "trapezoidal",
      "size": "Tr 40x7",
      "starts": 1
    },
    "load": {
      "axial": "18 kN",
      "sense": "compression"
    },
    "friction": {
      "thread": {
        "entry": "thread/steel-bronze/oil"
      },
      "collar": {
        "entry": "collar/soft-steel-bronze"
      }
    },
    "collar": {
      "kind": "annular",
      "outerDiameter": "70 mm",
      "innerDiameter": "42 mm",
      "model": "uniform-wear"
    },
    "nut": {
      "length": "60 mm",
      "material": "bronze"
    },
    "screw": {
      "material": "steel-1045-cd",
      "unsupportedLength": "520 mm",
      "ends": "fixed-pinned"
    },
    "duty": {
      "kind": "lifting",
      "speed": "60 rpm",
      "brake": true,
      "vibration": false
    },
    "drive": {
      "availableTorque": "220 N*m"
    }
  },
  "normalized": {
    "thread": {
      "form": "trapezoidal",
      "size": "Tr 40x7",
      "majorDiameter": 0.04,
      "pitch": 0.007,
      "starts": 1,
      "loadFlankAngle": null
    },
    "load": {
      "axial": 18000,
      "sense": "compression"
    },
    "friction": {
      "thread": {
        "min": 0.1,
        "max": 0.16,
        "source": {
          "kind": "handbook",
          "reference": "Shigley's Mechanical Engineering Design, 9th ed., Table 8-5 (after Rothbart & Brown, Mechanical Design Handbook, 2nd ed.)"
        },
        "entry": "thread/steel-bronze/oil"
      },
      "collar": {
        "min": 0.08,
        "max": 0.1,
        "source": {
          "kind": "handbook",
          "reference": "Shigley's Mechanical Engineering Design, 9th ed., Table 8-6, running to starting (after Rothbart & Brown, 2nd ed.)"
        },
        "entry": "collar/soft-steel-bronze"
      }
    },
    "collar": {
      "kind": "annular",
      "outerDiameter": 0.07,
      "innerDiameter": 0.042,
      "model": "uniform-wear"
    },
    "nut": {
      "length": 0.06,
      "material": "bronze",
      "allowablePressure": 11031611.669069378,
      "allowablePv": 2626902.5286971456,
      "yieldStrength": 125000000
    },
    "screw": {
      "material": "steel-1045-cd",
      "yieldStrength": 530000000,
      "elasticModulus": 207000000000,
      "density": 7801,
      "unsupportedLength": 0.52,
      "ends": "fixed-pinned",
      "endConditionBasis": "recommended"
    },
    "duty": {
      "kind": "lifting",
      "speed": 60,
      "linearSpeed": null,
      "brake": true,
      "vibration": false
    },
    "drive": {
      "availableTorque": 220
    },
    "unitSystem": "SI"
  },
  "evaluation": {
    "engineVersion": "1.0.0",
    "geometry": {
      "form": "trapezoidal",
      "size": "Tr 40x7",
      "standard": "ISO 2901/2903/2904 metric trapezoidal (30 deg)",
      "majorDiameter": 0.04,
      "pitch": 0.007,
      "starts": 1,
      "lead": 0.007,
      "meanDiameter": 0.0365,
      "minorDiameter": 0.032,
      "threadHeight": 0.0035,
      "crestClearance": 0.0005,
      "nutMajorDiameter": 0.041,
      "flankAngle": 15,
      "leadAngle": 3.493327691746057,
      "normalFlankAngle": 14.973381380851615,
      "engagedThreads": 8.571428571428571,
      "rootThickness": 0.004705771365940052,
      "nutRootThickness": 0.0047057713659400535
    },
    "torque": {
      "raise": {
        "atMinFriction": 94.7218887636769,
        "atMaxFriction": 125.621406413488
      },
      "lower": {
        "atMinFriction": 54.18346523748896,
        "atMaxFriction": 84.40996461577738
      },
      "collar": {
        "atMinFriction": 40.32000000000001,
        "atMaxFriction": 50.400000000000006
      },
      "threadRaise": {
        "atMinFriction": 54.40188876367689,
        "atMaxFriction": 75.221406413488
      },
      "threadLower": {
        "atMinFriction": 13.863465237488956,
        "atMaxFriction": 34.00996461577738
      },
      "raiseSecAlpha": {
        "atMinFriction": 54.40618806773659,
        "atMaxFriction": 75.2283380993233
      }
    },
    "efficiency": {
      "atMinFriction": 0.21170949071349976,
      "atMaxFriction": 0.1596345989279233,
      "thread": {
        "atMinFriction": 0.36861813597487025,
        "atMaxFriction": 0.2665932981809152
      }
    },
    "selfLocking": {
      "locks": true,
      "margin": 1.6956917465293164,
      "boundaryFriction": 0.058972982680771176,
      "backDrivingTorque": null
    },
    "stresses": {
      "body": {
        "axial": -22381163.872297782,
        "torsion": 19524675.575061075,
        "vonMises": 40553117.82357562,
        "atMinFriction": {
          "torsion": 14722125.796620935,
          "vonMises": 33928446.18006021
        }
      },
      "firstThread": {
        "bearing": 17042971.596846405,
        "rootBending": 41479009.17272437,
        "rootShear": 21687859.294730134,
        "vonMises": 65524133.48316059
      },
      "mean": {
        "bearing": 5232491.279733546,
        "rootBending": 12734783.517941693,
        "rootShear": 6658553.292241708,
        "vonMises": 45735646.41780999
      },
      "stripping": {
        "screw": 4439035.528161139,
        "nut": 3464613.095150156
      }
    },
    "buckling": {
      "applies": true,
      "endConditionConstant": 1.2,
      "endConditionBasis": "recommended",
      "slenderness": 65,
      "transitionSlenderness": 96.1839772721478,
      "regime": "johnson",
      "criticalLoad": 328918.9965665638,
      "safetyFactor": 18.27327758703132
    },
    "criticalSpeed": {
      "rpm": 22438.740829464627,
      "frequencyFactor": 3.926602,
      "operatingRpm": 60,
      "ratio": 0.0026739468340047476
    },
    "wear": {
      "bearingPressure": 5232491.279733546,
      "slidingVelocity": 0.11488159323125395,
      "pv": 601116.9347844326,
      "allowablePressure": 11031611.669069378,
      "allowablePv": 2626902.5286971456,
      "pressureRatio": 0.47431793619100054,
      "pvRatio": 0.22883107698806252
    },
    "power": {
      "input": 789.3025750444633,
      "linearSpeed": 0.007,
      "rotationalSpeed": 60
    },
    "drive": {
      "availableTorque": 220,
      "requiredTorque": 125.621406413488,
      "margin": 1.7512938780183769
    },
    "safetyFactors": {
      "bodyVonMises": 13.06927872489951,
      "firstThreadRoot": 8.088622799356937,
      "strippingScrew": 68.8910908822307,
      "strippingNut": 20.817620328504276,
      "buckling": 18.27327758703132
    },
    "findings": [],
    "trace": {
      "geometry.lead": {
        "formula": "lead",
        "inputs": {
          "n_s": 1,
          "p": 0.007
        }
      },
      "geometry.meanDiameter": {
        "formula": "mean-diameter-half-pitch",
        "inputs": {
          "d": 0.04,
          "p": 0.007
        }
      },
      "geometry.minorDiameter": {
        "formula": "minor-diameter-trapezoidal",
        "inputs": {
          "d": 0.04,
          "p": 0.007,
          "a_c": 0.0005
        }
      },
      "geometry.leadAngle": {
        "formula": "lead-angle",
        "inputs": {
          "l": 0.007,
          "d_m": 0.0365
        }
      },
      "geometry.normalFlankAngle": {
        "formula": "normal-flank-angle",
        "inputs": {
          "alpha": 15,
          "lambda": 3.493327691746057
        }
      },
      "geometry.engagedThreads": {
        "formula": "engaged-threads",
        "inputs": {
          "L_nut": 0.06,
          "p": 0.007
        }
      },
      "torque.threadRaise.atMinFriction": {
        "formula": "thread-raise-torque",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.1,
          "alpha_n": 14.973381380851615
        }
      },
      "torque.threadRaise.atMaxFriction": {
        "formula": "thread-raise-torque",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.16,
          "alpha_n": 14.973381380851615
        }
      },
      "torque.threadLower.atMinFriction": {
        "formula": "thread-lower-torque",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.1,
          "alpha_n": 14.973381380851615
        }
      },
      "torque.threadLower.atMaxFriction": {
        "formula": "thread-lower-torque",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.16,
          "alpha_n": 14.973381380851615
        }
      },
      "torque.collar.atMinFriction": {
        "formula": "collar-torque-uniform-wear",
        "inputs": {
          "F": 18000,
          "f_c": 0.08,
          "D_o": 0.07,
          "D_i": 0.042
        }
      },
      "torque.collar.atMaxFriction": {
        "formula": "collar-torque-uniform-wear",
        "inputs": {
          "F": 18000,
          "f_c": 0.1,
          "D_o": 0.07,
          "D_i": 0.042
        }
      },
      "torque.raise.atMinFriction": {
        "formula": "raise-torque-total",
        "inputs": {
          "T_thread": 54.40188876367689,
          "T_c": 40.32000000000001
        }
      },
      "torque.raise.atMaxFriction": {
        "formula": "raise-torque-total",
        "inputs": {
          "T_thread": 75.221406413488,
          "T_c": 50.400000000000006
        }
      },
      "torque.lower.atMinFriction": {
        "formula": "lower-torque-total",
        "inputs": {
          "T_thread": 13.863465237488956,
          "T_c": 40.32000000000001
        }
      },
      "torque.lower.atMaxFriction": {
        "formula": "lower-torque-total",
        "inputs": {
          "T_thread": 34.00996461577738,
          "T_c": 50.400000000000006
        }
      },
      "torque.raiseSecAlpha.atMinFriction": {
        "formula": "thread-raise-torque-sec-alpha",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.1,
          "alpha": 15
        }
      },
      "torque.raiseSecAlpha.atMaxFriction": {
        "formula": "thread-raise-torque-sec-alpha",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "l": 0.007,
          "f": 0.16,
          "alpha": 15
        }
      },
      "efficiency.atMinFriction": {
        "formula": "efficiency",
        "inputs": {
          "F": 18000,
          "l": 0.007,
          "T": 94.7218887636769
        }
      },
      "efficiency.atMaxFriction": {
        "formula": "efficiency",
        "inputs": {
          "F": 18000,
          "l": 0.007,
          "T": 125.621406413488
        }
      },
      "efficiency.thread.atMinFriction": {
        "formula": "efficiency",
        "inputs": {
          "F": 18000,
          "l": 0.007,
          "T": 54.40188876367689
        }
      },
      "efficiency.thread.atMaxFriction": {
        "formula": "efficiency",
        "inputs": {
          "F": 18000,
          "l": 0.007,
          "T": 75.221406413488
        }
      },
      "selfLocking.margin": {
        "formula": "self-locking-margin",
        "inputs": {
          "f_min": 0.1,
          "lambda": 3.493327691746057,
          "alpha_n": 14.973381380851615
        }
      },
      "stresses.body.axial": {
        "formula": "body-axial-stress",
        "inputs": {
          "F": -18000,
          "d_r": 0.032
        }
      },
      "stresses.body.torsion": {
        "formula": "body-torsion-stress",
        "inputs": {
          "T": 125.621406413488,
          "d_r": 0.032
        }
      },
      "stresses.body.vonMises": {
        "formula": "von-mises-axial-torsion",
        "inputs": {
          "sigma": -22381163.872297782,
          "tau": 19524675.575061075
        }
      },
      "stresses.firstThread.bearing": {
        "formula": "thread-bearing-stress",
        "inputs": {
          "F_t": 6840,
          "d_m": 0.0365,
          "h": 0.0035
        }
      },
      "stresses.firstThread.rootBending": {
        "formula": "thread-root-bending",
        "inputs": {
          "F_t": 6840,
          "d_r": 0.032,
          "a": 0.0022499999999999985,
          "b": 0.004705771365940052
        }
      },
      "stresses.firstThread.rootShear": {
        "formula": "thread-root-shear",
        "inputs": {
          "F_t": 6840,
          "d_r": 0.032,
          "b": 0.004705771365940052
        }
      },
      "stresses.firstThread.vonMises": {
        "formula": "thread-root-von-mises",
        "inputs": {
          "sigma_b": 41479009.17272437,
          "sigma": -22381163.872297782,
          "tau": 19524675.575061075
        }
      },
      "stresses.mean.bearing": {
        "formula": "thread-bearing-stress",
        "inputs": {
          "F_t": 2100,
          "d_m": 0.0365,
          "h": 0.0035
        }
      },
      "stresses.mean.rootBending": {
        "formula": "thread-root-bending",
        "inputs": {
          "F_t": 2100,
          "d_r": 0.032,
          "a": 0.0022499999999999985,
          "b": 0.004705771365940052
        }
      },
      "stresses.mean.rootShear": {
        "formula": "thread-root-shear",
        "inputs": {
          "F_t": 2100,
          "d_r": 0.032,
          "b": 0.004705771365940052
        }
      },
      "stresses.mean.vonMises": {
        "formula": "thread-root-von-mises",
        "inputs": {
          "sigma_b": 12734783.517941693,
          "sigma": -22381163.872297782,
          "tau": 19524675.575061075
        }
      },
      "stresses.stripping.screw": {
        "formula": "thread-stripping-screw",
        "inputs": {
          "F": 18000,
          "d_r": 0.032,
          "b": 0.004705771365940052,
          "n_t": 8.571428571428571
        }
      },
      "stresses.stripping.nut": {
        "formula": "thread-stripping-nut",
        "inputs": {
          "F": 18000,
          "D": 0.041,
          "b_n": 0.0047057713659400535,
          "n_t": 8.571428571428571
        }
      },
      "buckling.slenderness": {
        "formula": "slenderness",
        "inputs": {
          "l": 0.52,
          "k": 0.008
        }
      },
      "buckling.transitionSlenderness": {
        "formula": "transition-slenderness",
        "inputs": {
          "C": 1.2,
          "E": 207000000000,
          "S_y": 530000000
        }
      },
      "buckling.criticalLoad": {
        "formula": "johnson-critical-load",
        "inputs": {
          "C": 1.2,
          "E": 207000000000,
          "S_y": 530000000,
          "A": 0.0008042477193189871,
          "l/k": 65
        }
      },
      "buckling.safetyFactor": {
        "formula": "buckling-safety-factor",
        "inputs": {
          "P_cr": 328918.9965665638,
          "F": 18000
        }
      },
      "criticalSpeed.rpm": {
        "formula": "critical-speed",
        "inputs": {
          "beta_1L": 3.926602,
          "d_r": 0.032,
          "L": 0.52,
          "E": 207000000000,
          "rho": 7801
        }
      },
      "criticalSpeed.ratio": {
        "formula": "critical-speed-ratio",
        "inputs": {
          "n": 60,
          "n_c": 22438.740829464627
        }
      },
      "wear.bearingPressure": {
        "formula": "nut-bearing-pressure",
        "inputs": {
          "F": 18000,
          "d_m": 0.0365,
          "h": 0.0035,
          "n_t": 8.571428571428571
        }
      },
      "wear.slidingVelocity": {
        "formula": "sliding-velocity",
        "inputs": {
          "d_m": 0.0365,
          "n": 1,
          "lambda": 3.493327691746057
        }
      },
      "wear.pv": {
        "formula": "pv",
        "inputs": {
          "p": 5232491.279733546,
          "v_s": 0.11488159323125395
        }
      },
      "power.input": {
        "formula": "input-power",
        "inputs": {
          "T_R": 125.621406413488,
          "n": 1
        }
      },
      "power.linearSpeed": {
        "formula": "linear-speed",
        "inputs": {
          "l": 0.007,
          "n": 1
        }
      },
      "drive.margin": {
        "formula": "drive-margin",
        "inputs": {
          "T_av": 220,
          "T_R": 125.621406413488
        }
      }
    }
  },
  "findings": [],
  "verdict": "clear"
};
