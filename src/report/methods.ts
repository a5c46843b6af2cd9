/**
 * The methods appendix for technical reviewers, with its references: how the curve was measured, the
 * families and their fit, the backtest (with its chart), the sources of uncertainty and how the runs
 * were weighed. Each paragraph is built by its own function and listed in `methodsSection`; a
 * reference is listed only when a paragraph cites it.
 */
import { learnedForecastText } from "./forecastMethodText.js";
import { curveFamilies } from "../fit/families.js";
import {
  likelyRange,
  capitalize,
  countInWords,
  formatCount,
  formatLevel,
  formatNumber,
  formatProbability,
  formatScore,
  formatSignificant,
  scoreStyle,
  type MetricInfo,
} from "../format.js";
import { accuracy } from "../curve/metrics.js";
import { mostCommonClass } from "../curve/mostCommonClass.js";
import { limitsInWords } from "../weigh/decisionWords.js";
import type { ReportInput } from "./reportInput.js";

import { escapeHtml } from "./pageSecurity.js";
import { familyLabel } from "./backtestChart.js";
import type { ReportChart } from "./charts.js";
import { chartFigure } from "./sections.js";

function parametersInWords(parameters: Record<string, number>): string {
  return Object.entries(parameters)
    .map(([name, value]) => `${name} = ${formatSignificant(value)}`)
    .join(", ");
}

/** The splitters of curve.json in words. */
const splitterWords: Record<string, string> = {
  "stratified-k-fold": "stratified k-fold cross-validation",
  "k-fold": "k-fold cross-validation",
  "leave-one-out": "leave-one-out cross-validation",
  "grouped-k-fold": "grouped k-fold cross-validation",
  "leave-one-group-out": "leave-one-group-out cross-validation",
};

/** "stratified k-fold cross-validation (5 folds, repeated 10 times)", as curve.json says it was measured. */
function designInWords(curve: ReportInput["curve"]): string {
  const method = (curve.splitter && splitterWords[curve.splitter]) || "cross-validation";
  const details = [
    ...(curve.folds ? [`${curve.folds} folds`] : []),
    ...(curve.repeats ? [`repeated ${curve.repeats} ${curve.repeats === 1 ? "time" : "times"}`] : []),
  ];
  return details.length > 0 ? `${method} (${details.join(", ")})` : method;
}

/** A family by name with its formula when the fitter knows it: "pow3 (score = a − b·n^(−c) ...)". */
function familyInWords(name: string): string {
  const family = curveFamilies.find((f) => f.name === name);
  return family ? `${name} (${family.formula})` : name;
}

/** The references the methods cite, by key; each is listed only when the text cites it. */
const references = {
  efron: "Efron, B. and Tibshirani, R. J. (1993). An Introduction to the Bootstrap. Chapman & Hall.",
  hyndman:
    "Hyndman, R. J. and Fan, Y. (1996). Sample quantiles in statistical packages. The American Statistician 50(4), 361–365.",
  marquardt:
    "Marquardt, D. W. (1963). An algorithm for least-squares estimation of nonlinear parameters. Journal of the Society for Industrial and Applied Mathematics 11(2), 431–441.",
  figueroa:
    "Figueroa, R. L., Zeng-Treitler, Q., Kandula, S. and Ngo, L. H. (2012). Predicting sample size required for classification performance. BMC Medical Informatics and Decision Making 12, 8.",
  mukherjee:
    "Mukherjee, S., Tamayo, P., Rogers, S. et al. (2003). Estimating dataset size requirements for classifying DNA microarray data. Journal of Computational Biology 10(2), 119–142.",
  mohr: "Mohr, F., Viering, T. J., Loog, M. and van Rijn, J. N. (2022). LCDB 1.0: An extensive learning curves database for classification tasks. ECML PKDD 2022.",
  domhan:
    "Domhan, T., Springenberg, J. T. and Hutter, F. (2015). Speeding up automatic hyperparameter optimization of deep neural networks by extrapolation of learning curves. IJCAI 2015.",
  bates:
    "Bates, J. M. and Granger, C. W. J. (1969). The combination of forecasts. Operational Research Quarterly 20(4), 451–468.",
  burkner:
    "Bürkner, P.-C., Gabry, J. and Vehtari, A. (2020). Approximate leave-future-out cross-validation for Bayesian time series models. Journal of Statistical Computation and Simulation 90(14), 2499–2523.",
  hoeting:
    "Hoeting, J. A., Madigan, D., Raftery, A. E. and Volinsky, C. T. (1999). Bayesian model averaging: a tutorial. Statistical Science 14(4), 382–417.",
  nadeau: "Nadeau, C. and Bengio, Y. (2003). Inference for the generalization error. Machine Learning 52(3), 239–281.",
  bousquet:
    "Bousquet, O. and Elisseeff, A. (2002). Stability and generalization. Journal of Machine Learning Research 2, 499–526.",
  raiffa: "Raiffa, H. and Schlaifer, R. (1961). Applied Statistical Decision Theory. Harvard University.",
  wilson:
    "Wilson, E. B. (1927). Probable inference, the law of succession, and statistical inference. Journal of the American Statistical Association 22(158), 209–212.",
  clopper:
    "Clopper, C. J. and Pearson, E. S. (1934). The use of confidence or fiducial limits illustrated in the case of the binomial. Biometrika 26(4), 404–413.",
  beleites:
    "Beleites, C., Neugebauer, U., Bocklitz, T., Krafft, C. and Popp, J. (2013). Sample size planning for classification models. Analytica Chimica Acta 760, 25–33.",
  okabe:
    "Okabe, M. and Ito, K. (2008). Color Universal Design (CUD): how to make figures and presentations that are friendly to colorblind people.",
} as const;

/** One paragraph of the appendix, with the chart that goes with it. */
export interface MethodParagraph {
  heading: string;
  text: string;
  figure?: ReportChart;
}

function methodParagraph({ heading, text, figure }: MethodParagraph): string {
  return `<h3>${escapeHtml(heading)}</h3>\n<p>${escapeHtml(text)}</p>` + (figure ? `\n${chartFigure(figure)}` : "");
}

/**
 * The appendix. The backtest chart, whose families and errors speak to a technical reviewer, is
 * drawn here beside its paragraph rather than among the lead's charts.
 */
export function methodsSection(input: ReportInput, info: MetricInfo, backtestChart?: ReportChart): string {
  const { curve, forecast, decision } = input;
  const cited = new Set<keyof typeof references>();
  const sizes = forecast.measured.map((m) => m.trainingSize);
  const design = designInWords(curve);
  const source = curve.source ? `, file ${curve.source.file}` : "";
  const measurement = [
    `${capitalize(info.inSentence)} was measured by ${design} on subsamples of ${sizes.length} training sizes ` +
      `from ${formatCount(Math.min(...sizes))} to ${formatCount(Math.max(...sizes))} samples, drawn from a ` +
      `data set of ${formatCount(curve.rows)} rows${source}` +
      `${curve.learner ? `, with the learner ${curve.learner}` : ""}` +
      `${curve.label ? `, predicting the column ${curve.label}` : ""}` +
      `${curve.group ? `, keeping groups of ${curve.group} together` : ""}.`,
  ];
  if (curve.classNames && curve.classNames.length > 0) {
    const counts = curve.classCounts?.length === curve.classNames.length ? curve.classCounts : undefined;
    const named = curve.classNames.map((name, k) =>
      counts === undefined ? name : `${name} (${formatCount(counts[k])} ${counts[k] === 1 ? "row" : "rows"})`,
    );
    const common = curve.metric === accuracy.name ? mostCommonClass(curve) : null;
    measurement.push(
      `Classes: ${named.join(", ")}.` +
        (common === null
          ? ""
          : ` Always answering ${common.name}, whatever the features, would score an accuracy of ${formatScore(common.share, scoreStyle(info, [common.share]))}: the level a model must clearly beat.`),
    );
  }
  if (curve.unit === "runs") {
    measurement.push(`Training sizes count whole runs (groups of ${curve.group ?? "rows"}), not rows.`);
  }
  if (curve.tuning) {
    measurement.push(
      `At every fit the learner's settings were chosen from ${curve.tuning.grid.length} candidates by an inner ` +
        `${curve.tuning.innerFolds}-fold cross-validation on the training rows only.`,
    );
  }

  const weighted = Object.entries(forecast.familyWeights ?? {}).filter(([, w]) => Number.isFinite(w) && w > 0);
  const backtest = forecast.backtest;
  const hasBacktest = backtest !== undefined && backtest.predictions.length > 0;
  const fitting: string[] = [];
  cited.add("marquardt");
  cited.add("figueroa");
  if (weighted.length > 1) {
    cited.add("mohr");
    cited.add("domhan");
    cited.add("bates");
    fitting.push(
      `${capitalize(countInWords(weighted.length))} learning-curve families were fitted (n is the number of training samples): ` +
        weighted
          .sort((a, b) => b[1] - a[1])
          .map(([name, w]) => `${familyInWords(name)}, weight ${formatNumber(100 * w, 0)}%`)
          .join("; ") +
        `.`,
      `Each was fitted to the mean score per training size by weighted least squares (Levenberg–Marquardt from ` +
        `several starting points, within bounds that keep the score in the metric's range), each size weighted by ` +
        `its number of fits over the variance of its scores, with a floor so that no size takes all the weight.`,
      `The weights are proportional to the inverse of each family's mean squared backtest error (Bates and ` +
        `Granger's combination of forecasts), the error floored at the noise of the held-back means; the ` +
        `expected score is the weighted mean of the families' curves. Fitted parameters of ${forecast.family}, ` +
        `the heaviest: ${parametersInWords(forecast.parameters)}.`,
    );
  } else {
    cited.add("mukherjee");
    fitting.push(
      `One learning-curve family was fitted: ${familyInWords(forecast.family)}, with n the number of training ` +
        `samples. It was fitted to the mean score per training size by weighted least squares (Levenberg–Marquardt ` +
        `from several starting points, within bounds that keep the score in the metric's range), each size ` +
        `weighted by its number of fits over the variance of its scores, with a floor so that no size takes all ` +
        `the weight. Fitted parameters: ${parametersInWords(forecast.parameters)}.`,
    );
  }

  const draws = forecast.projections[0]?.draws.length ?? 0;
  const level = formatLevel(forecast.level);
  cited.add("efron");
  cited.add("hyndman");
  const uncertainty: string[] = [];
  if (forecast.sampleStandardDeviation !== undefined) {
    cited.add("nadeau");
    if (weighted.length > 1) cited.add("hoeting");
    const shift = info.isFraction
      ? `${formatNumber(100 * forecast.sampleStandardDeviation, 1)} percentage points`
      : formatScore(forecast.sampleStandardDeviation, scoreStyle(info, [forecast.sampleStandardDeviation]));
    uncertainty.push(
      `A ${likelyRange(forecast.level)} holds the central ${level} of ${draws > 0 ? formatCount(draws) : "the"} drawn curves ` +
        `(quantiles by linear interpolation, Hyndman and Fan's definition 7), widened when needed to contain the ` +
        `expected score. Each drawn curve ` +
        (weighted.length > 1 ? `takes a family in proportion to its weight (model averaging); ` : "") +
        `resamples whole repeats of the cross-validation with replacement and is refitted (the bootstrap); adds ` +
        `one shift shared by every size, for which samples the lab happened to collect, with a standard deviation ` +
        `of ${shift} (Nadeau and Bengio's correction for overlapping training sets, which resampling repeats ` +
        `cannot see); and, beyond the largest measured size, the family's extrapolation error, growing with the ` +
        `square root of the log of the distance (a random walk in log size) at the rate its backtest errors ` +
        `showed. Draw j of every size comes from the same ` +
        `curve, so differences between sizes are taken curve by curve.`,
    );
  } else {
    uncertainty.push(
      `A ${likelyRange(forecast.level)} holds the central ${level} of a bootstrap over repeats: whole repeats of the ` +
        `cross-validation were resampled with replacement, the means recomputed and the curve refitted` +
        `${draws > 0 ? ` ${formatCount(draws)} times` : ""}; the range's ends are quantiles of the refitted ` +
        `curves (linear interpolation, Hyndman and Fan's definition 7). Draw j of every training size comes from ` +
        `the same refit, so differences between sizes are taken curve by curve.`,
    );
  }
  if (forecast.testSize !== undefined && forecast.projections.some((p) => p.singleModelLower !== undefined)) {
    cited.add("bousquet");
    uncertainty.push(
      `The wider interval is for one model scored on a test set of ${formatCount(forecast.testSize)} samples: ` +
        `it adds to each drawn curve the test set's sampling error (binomial for a score between 0 and 1) and the ` +
        `spread between models trained on different samples of the same size, shrinking as 1/n beyond the ` +
        `largest measured size.`,
    );
  }

  const weighing: string[] = [];
  if (decision) {
    const limits = limitsInWords(decision.plan);
    weighing.push(
      `The chance of reaching the target is the share of drawn curves that reach it at that size. The expected ` +
        `net value is the value of a point times the expected gain in points over today, minus the cost of the ` +
        `runs` +
        (decision.table.some((row) => row.netValueLower !== undefined)
          ? `; its interval and the chance that it is positive are taken draw by draw`
          : "") +
        `. The recommendation is the number of runs with the highest expected net value` +
        (limits ? ` within ${limits}.` : ` up to the plan's ${formatCount(decision.plan.maxRuns)} runs.`),
    );
    if (decision.stopAfterRuns !== undefined && decision.stopAfterRuns !== null) {
      weighing.push(
        `The stopping rule stops when no further number of runs${limits ? ` within ${limits}` : ""} is expected to ` +
          `add a gain worth more than it adds to the cost (so a fixed cost paid with the first run does not stop a ` +
          `programme that pays off over several runs).`,
      );
    }
    if (decision.valueOfInformation) {
      cited.add("raiffa");
      weighing.push(
        `The value of a pilot is the expected value of sample information of its cross-validated score for ` +
          `the decision to go on or stop, by Monte Carlo over the drawn curves (${formatCount(decision.valueOfInformation.simulations)} ` +
          `simulations).`,
      );
    }
    if (decision.validation?.heldOutNeeded !== undefined && decision.validation?.heldOutNeeded !== null) {
      cited.add("wilson");
      cited.add("clopper");
      cited.add("beleites");
      weighing.push(
        `The test-set size is the smallest for which a one-sided ${formatProbability(decision.validation.confidence)} ` +
          `lower bound (Wilson; Clopper–Pearson exact) of the expected score lies above the target.`,
      );
    }
    if (decision.sensitivity && decision.sensitivity.length > 0) {
      weighing.push(`The sensitivity analysis moves one assumption at a time by 25% and weighs the runs again.`);
    }
  }

  let backtestText: string;
  if (hasBacktest) {
    cited.add("burkner");
    const errors = Object.entries(backtest.rootMeanSquareError)
      .filter(([, e]) => Number.isFinite(e))
      .sort((a, b) => a[1] - b[1])
      .map(([name, e]) =>
        info.isFraction
          ? `${familyLabel(name)} ${formatNumber(100 * e, 1)} points`
          : `${familyLabel(name)} ${formatScore(e, scoreStyle(info, [e]))}`,
      );
    const cuts = [...new Set(backtest.predictions.map((p) => p.fittedUpTo))].sort((a, b) => a - b);
    backtestText =
      `Each family was fitted to the smaller measured sizes only, up to ${cuts.map(formatCount).join(", ")} ` +
      `samples in turn, and asked to predict the larger measured sizes held back (leave-future-out, as for time ` +
      `series). Typical misses (root mean square errors) of the ${formatCount(backtest.predictions.length)} ` +
      `predictions: ${errors.join(", ")}.` +
      (backtestChart ? ` The chart below shows every prediction against the measured mean.` : "");
  } else {
    backtestText =
      forecast.familyWeights !== undefined
        ? `No backtest was made: too few training sizes were measured to hold some back, so one family was used.`
        : `No backtest was made: with one family there is nothing to choose between.`;
  }

  cited.add("okabe");
  // In reading order. A further paragraph (say, on what the forecast learned from) is one more entry
  // here, built by its own function from the input, adding what it cites to `cited`.
  const learnedText = learnedForecastText(forecast);
  const learned = learnedText === undefined ? [] : [learnedText];
  const paragraphs: MethodParagraph[] = [
    { heading: "Measurement", text: measurement.join(" ") },
    { heading: "Curve families and fitting", text: fitting.join(" ") },
    { heading: "Backtest", text: backtestText, figure: backtestChart },
    ...learned.map((text) => ({ heading: "What the forecast learned from", text })),
    { heading: "Uncertainty", text: uncertainty.join(" ") },
    ...(weighing.length > 0 ? [{ heading: "Weighing the runs", text: weighing.join(" ") }] : []),
    {
      heading: "Charts",
      text: "The charts' colours are Okabe and Ito's palette, chosen to stay distinct under the common forms of colour blindness.",
    },
  ];
  const referenceList = (Object.keys(references) as Array<keyof typeof references>)
    .filter((key) => cited.has(key))
    .map((key) => `<li>${escapeHtml(references[key])}</li>`);
  return `<section id="methods">
<h2>Methods (for technical reviewers)</h2>
${paragraphs.map(methodParagraph).join("\n")}
<h3>References</h3>
<ol class="references">
${referenceList.join("\n")}
</ol>
</section>`;
}
