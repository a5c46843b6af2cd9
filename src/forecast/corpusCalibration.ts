/**
 * The forecast's learned continuation (gainCorrection.ts), written by
 * `npx tsx scripts/forecast-corpus/calibrate.ts --write`; do not edit by hand.
 *
 * Learned from the 600 classification pilot curves (3860 pilot-to-target cases) of the
 * 23 classification data sets of fixtures/forecast-corpus (logistic regression and random
 * forest, accuracy), pilots of 50 to 400 rows, targets 2 to 16 times the pilot; variant
 * "slope + distance left, calibrated in the large, per learner". Checked leave-one-data-set-out: see the README's forecast section.
 */
import type { CalibrationSet } from "./gainCorrection.js";

export const corpusCalibration: CalibrationSet = {
  pooled: {
    ownWeight: 0,
    chordWeight: 0,
    slopeWeight: 0.409,
    headroomWeight: 0.0741,
    spread: 0.7,
  },
  byLearner: {
    forest: {
      ownWeight: 0,
      chordWeight: 0,
      slopeWeight: 0.5568,
      headroomWeight: 0.0602,
      spread: 1,
      learner: "forest",
    },
    logistic: {
      ownWeight: 0,
      chordWeight: 0,
      slopeWeight: 0.251,
      headroomWeight: 0.0904,
      spread: 0.35,
      learner: "logistic",
    },
  },
};
