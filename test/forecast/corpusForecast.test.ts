/**
 * The forecast's headline figures on the corpus of measured learning curves (fixtures/forecast-corpus:
 * open data sets from Debian's scikit-learn, Weka, statsmodels and R packages, measured by headroom;
 * its README gives each origin). Each pilot curve is forecast by `forecastCurve` with the calibration
 * learned without its own data set (leave-one-out.json) and compared with the score measured later on
 * the whole data set. To keep the test short it forecasts the first pilot draw of each data set
 * and pilot size (scripts/forecast-corpus/evaluate-corpus.ts runs them all, for the README).
 *
 * The limits are the project's targets for the forecast (issue "The forecast understates what more
 * data buys"): the error a forecast adds to the pilot's own, the gain ratio overall and per data set,
 * the 80% interval's coverage, and the worst data set.
 */
import { readFileSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { calibrationFor, type CalibrationSet } from "../../src/forecast/gainCorrection.js";
import { packageRoot } from "../../src/packageRoot.js";
import { readCorpus } from "../../scripts/forecast-corpus/corpus.js";
import { corpusPilots, forecastPilot, summarise, type CaseResult } from "../../scripts/forecast-corpus/cases.js";

const corpusDir = `${packageRoot}/fixtures/forecast-corpus`;
const leaveOneOut = JSON.parse(readFileSync(`${corpusDir}/leave-one-out.json`, "utf8")) as Record<
  string,
  CalibrationSet
>;
const pilots = corpusPilots(readCorpus(corpusDir)).filter((p) => p.draw === 1);

/**
 * Limits per learner, in score units (0.01 = 1 point of accuracy). The targets: at most 0.005 of error
 * added to the pilot's own overall, 0.01 from 100-row pilots, and no data set off by more than 0.05 on
 * average. Where the forecast does not meet one yet (the random forest's added error, and the worst
 * data set: README, "How far the forecast can be trusted"), the limit is today's figure on this
 * subset (forest 0.0086 and 0.0112 added; worst data set: logistic 0.088, forest 0.106, both infert)
 * plus a margin, so that a change for the worse still fails.
 */
const LIMITS: Record<string, { overall: number; fromHundred: number; worstDataSet: number }> = {
  logistic: { overall: 0.005, fromHundred: 0.01, worstDataSet: 0.1 },
  forest: { overall: 0.011, fromHundred: 0.014, worstDataSet: 0.12 },
};

function casesOf(learner: string): CaseResult[] {
  return pilots
    .filter((p) => p.learner === learner)
    .flatMap((p) => forecastPilot(p, calibrationFor(leaveOneOut[p.dataSet], p.learner), { draws: 100 }));
}

describe.each(["logistic", "forest"])("forecast on the corpus's %s curves, leave-one-data-set-out", (learner) => {
  const cases = casesOf(learner);
  const all = summarise(cases);
  const fromHundred = summarise(cases.filter((c) => c.pilot >= 100));
  const limits = LIMITS[learner];

  it("adds little error to the pilot's own", () => {
    expect(all.meanAbsoluteError - all.floor).toBeLessThanOrEqual(limits.overall);
    expect(fromHundred.meanAbsoluteError - fromHundred.floor).toBeLessThanOrEqual(limits.fromHundred);
    expect(all.worstDataSet.meanAbsoluteError).toBeLessThanOrEqual(limits.worstDataSet);
  });

  it("forecasts the gain from more data without a one-sided bias", () => {
    expect(all.gainRatio).toBeGreaterThanOrEqual(0.85);
    expect(all.gainRatio).toBeLessThanOrEqual(1.15);
  });

  it("gives 80% intervals that hold the later score about 80% of the time", () => {
    expect(all.coverage).toBeGreaterThanOrEqual(0.75);
    expect(all.coverage).toBeLessThanOrEqual(0.9);
  });

  it("keeps every interval inside the metric's range", () => {
    for (const c of cases) {
      expect(c.lower).toBeGreaterThanOrEqual(0);
      expect(c.upper).toBeLessThanOrEqual(1);
    }
  });
});
