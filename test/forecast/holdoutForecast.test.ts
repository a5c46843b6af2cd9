/**
 * The forecast on data sets it never learned from (fixtures/forecast-holdout: four of Breiman's
 * generated populations from R's mlbench, R's Titanic table, and four two-class data sets of R's
 * kernlab and caret packages, measured by headroom as the corpus was; its README gives each origin).
 * Each pilot curve is forecast by `forecastCurve` with the shipped calibration, which was learned from
 * fixtures/forecast-corpus only, and compared with the score measured later on the whole data set. To
 * keep the test short it forecasts the first pilot draw of each data set and pilot size
 * (`evaluate-corpus.ts --corpus fixtures/forecast-holdout --shipped` runs them all, for the README).
 *
 * The limits are the project's targets for the forecast where it meets them here; where it does not
 * (README, "How far the forecast can be trusted"), today's figure on this subset plus a margin, so
 * that a change for the worse still fails: logistic regression adds 0.0066 to the pilot's own error,
 * its worst data set (musk) is off by 0.063 and the random forest's (musk) by 0.057, and the random
 * forest's 80% intervals hold the later score 93% of the time, too wide.
 */
import { describe, expect, it } from "vitest";
import { calibrationFor, shippedCalibrations } from "../../src/forecast/gainCorrection.js";
import { packageRoot } from "../../src/packageRoot.js";
import { readCorpus } from "../../scripts/forecast-corpus/corpus.js";
import { corpusPilots, forecastPilot, summarise } from "../../scripts/forecast-corpus/cases.js";

const pilots = corpusPilots(readCorpus(`${packageRoot}/fixtures/forecast-holdout`)).filter((p) => p.draw === 1);

/** In score units (0.01 = 1 point of accuracy). */
const LIMITS: Record<
  string,
  { addedError: number; worstDataSet: number; gainRatio: [number, number]; coverage: [number, number] }
> = {
  logistic: { addedError: 0.009, worstDataSet: 0.075, gainRatio: [0.85, 1.15], coverage: [0.75, 0.9] },
  forest: { addedError: 0.005, worstDataSet: 0.07, gainRatio: [0.85, 1.15], coverage: [0.75, 0.95] },
};

describe.each(["logistic", "forest"])("forecast of the held-out data sets' %s curves", (learner) => {
  const cases = pilots
    .filter((p) => p.learner === learner)
    .flatMap((p) => forecastPilot(p, calibrationFor(shippedCalibrations, p.learner), { draws: 100 }));
  const all = summarise(cases);
  const limits = LIMITS[learner];

  it("covers every held-out data set", () => {
    expect(new Set(cases.map((c) => c.dataSet))).toEqual(
      new Set(["cells", "mdrr", "musk", "ringnorm", "spam", "threenorm", "titanic", "twonorm", "waveform"]),
    );
  });

  it("adds little error to the pilot's own", () => {
    expect(all.meanAbsoluteError - all.floor).toBeLessThanOrEqual(limits.addedError);
    expect(all.worstDataSet.meanAbsoluteError).toBeLessThanOrEqual(limits.worstDataSet);
  });

  it("forecasts the gain from more data within its limits", () => {
    expect(all.gainRatio).toBeGreaterThanOrEqual(limits.gainRatio[0]);
    expect(all.gainRatio).toBeLessThanOrEqual(limits.gainRatio[1]);
  });

  it("gives 80% intervals that hold the later score about 80% of the time", () => {
    expect(all.coverage).toBeGreaterThanOrEqual(limits.coverage[0]);
    expect(all.coverage).toBeLessThanOrEqual(limits.coverage[1]);
  });
});
