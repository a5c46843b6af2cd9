/**
 * The forecast's learned continuation (gainCorrection.ts), written by
 * `npx tsx scripts/forecast-corpus/calibrate.ts --write`; do not edit by hand.
 *
 * Learned from the 660 classification pilot curves (4070 pilot-to-target cases) of the
 * 23 classification data sets of fixtures/forecast-corpus (logistic regression and random
 * forest, accuracy), pilots of 50 to 800 rows, targets 2 to 16 times the pilot; variant
 * "slope × L/(L + r) + distance left × (1 − 1/K) × r/(L + r), calibrated in the large, per learner". Checked leave-one-data-set-out: see the README's forecast section.
 */
import type { CalibrationSet } from "./gainCorrection.js";

export const corpusCalibration: CalibrationSet = {
  pooled: {
    ownWeight: 0,
    chordWeight: 0,
    slopeWeight: 0.7306,
    headroomWeight: 0.2463,
    spread: 0.5,
    gainSpread: 0,
    reliabilitySize: 100,
  },
  byLearner: {
    forest: {
      ownWeight: 0,
      chordWeight: 0,
      slopeWeight: 0.9079,
      headroomWeight: 0.2392,
      spread: 0.7,
      gainSpread: 0,
      reliabilitySize: 100,
      learner: "forest",
    },
    logistic: {
      ownWeight: 0,
      chordWeight: 0,
      slopeWeight: 0.4691,
      headroomWeight: 0.2772,
      spread: 0,
      gainSpread: 0,
      reliabilitySize: 100,
      learner: "logistic",
    },
  },
};
