/**
 * Learning-curve families: parametric shapes of the expected score as a function of training size,
 * and the multi-start weighted fit that puts one of them through measured points.
 *
 * Orientation. A family is written once, for a curve that rises with training size. Every score is
 * first turned into an oriented value, `sign · score` with sign +1 when higher is better (accuracy)
 * and −1 when lower is better (log loss, error rate); the family is fitted to the oriented values
 * and its predictions are turned back by the same sign. So pow3 reads `score = a − b·n^(−c)` for a
 * higher-is-better metric and `score = a + b·n^(−c)` for a lower-is-better one, with `a` the
 * asymptote in the metric's own units in both cases (see `scoreParameters`).
 *
 * Adding a family (pow4, mmf4, wbl4, exp3, ilog2, ...) means writing one more `CurveFamily` and
 * listing it in `curveFamilies`; the fitter and the forecast do not change.
 */
import { FitError } from "../errors.js";
import { fitLeastSquares, type LeastSquaresResult } from "./levenbergMarquardt.js";

/** Which way is better, and the metric's possible range. */
export interface Orientation {
  higherIsBetter: boolean;
  /** Lowest and highest possible score, when the metric is bounded (accuracy: [0, 1]). */
  metricRange?: [number, number];
}

/** One measured point in oriented units: `value = sign · mean score`, `weight = 1/variance`. */
export interface OrientedPoint {
  trainingSize: number;
  value: number;
  weight: number;
}

export interface ParameterBounds {
  lower: number[];
  upper: number[];
}

/** A parametric learning-curve shape, written for a rising (oriented) curve. */
export interface CurveFamily {
  /** Short identifier, as written in forecast.json. */
  name: string;
  /** One name per parameter, in the order of the parameter vectors. */
  parameterNames: readonly string[];
  /** The formula in words and symbols, in the metric's own units (n = training size). */
  formula: string;
  /** Oriented value at training size n. */
  model(trainingSize: number, parameters: readonly number[]): number;
  /** Partial derivatives of `model` with respect to each parameter. */
  jacobian(trainingSize: number, parameters: readonly number[]): number[];
  /** Several starting vectors for the fit, from the oriented points. */
  initialGuesses(points: readonly OrientedPoint[]): number[][];
  /** Box bounds for the parameters in oriented units. */
  bounds(points: readonly OrientedPoint[], orientation: Orientation): ParameterBounds;
  /** Parameters in the metric's own units, by name (for reports and forecast.json). */
  scoreParameters(parameters: readonly number[], orientation: Orientation): Record<string, number>;
}

/** +1 when higher is better, −1 when lower is better. */
export function orientationSign(orientation: Orientation): 1 | -1 {
  return orientation.higherIsBetter ? 1 : -1;
}

/** The metric range in oriented units (`sign · score`), low end first; undefined when unbounded. */
export function orientedRange(orientation: Orientation): [number, number] | undefined {
  const range = orientation.metricRange;
  if (range === undefined) return undefined;
  const sign = orientationSign(orientation);
  // `+ 0` turns the −0 of −1·0 into 0.
  const ends = [sign * range[0] + 0, sign * range[1] + 0].sort((p, q) => p - q);
  return [ends[0], ends[1]];
}

/** Exponents c from which pow3 starts: the typical range of learning-curve exponents and beyond. */
const pow3StartExponents = [0.1, 0.3, 0.6, 1, 2];
/** pow3's exponent is kept in (0, 3]; this is the open end's stand-in. */
const pow3SmallestExponent = 1e-3;
const pow3LargestExponent = 3;

/**
 * pow3, the three-parameter inverse power law (Frey and Fisher 1999; Mukherjee et al. 2003;
 * Figueroa et al. 2012): oriented value `a − b·n^(−c)` with asymptote a, gap scale b ≥ 0 and decay
 * exponent c in (0, 3].
 *
 * Starting points: for each exponent in `pow3StartExponents` the model is linear in (a, b), so a
 * weighted linear regression of the values on n^(−c) gives a and b directly (b is made positive
 * when the points do not rise).
 */
export const pow3: CurveFamily = {
  name: "pow3",
  parameterNames: ["a", "b", "c"],
  formula:
    "score = a − b·n^(−c) when higher is better, a + b·n^(−c) when lower is better (a: asymptote, b ≥ 0, 0 < c ≤ 3)",
  model(n, [a, b, c]) {
    return a - b * Math.pow(n, -c);
  },
  jacobian(n, [, b, c]) {
    const power = Math.pow(n, -c);
    return [1, -power, b * power * Math.log(n)];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const values = points.map((p) => p.value);
    const spread = Math.max(Math.max(...values) - Math.min(...values), 1e-6 * Math.max(1, ...values.map(Math.abs)));
    return pow3StartExponents.map((c) => {
      const line = weightedLine(
        points.map((p) => Math.pow(p.trainingSize, -c)),
        values,
        points.map((p) => p.weight),
      );
      let a = line.intercept;
      let b = -line.slope;
      if (!(b > 0) || !Number.isFinite(a) || !Number.isFinite(b)) {
        // The points do not rise: start from a gentle rise up to the best value.
        a = Math.max(...values);
        b = 0.5 * spread * Math.pow(smallestSize, c);
      }
      return [a, b, c];
    });
  },
  bounds(_points, orientation) {
    const range = orientedRange(orientation);
    return {
      lower: [range?.[0] ?? -Infinity, 0, pow3SmallestExponent],
      upper: [range?.[1] ?? Infinity, Infinity, pow3LargestExponent],
    };
  },
  scoreParameters([a, b, c], orientation) {
    return { a: orientationSign(orientation) * a, b, c };
  },
};

/** Every family the fitter knows, in the order they are tried or listed. */
export const curveFamilies: readonly CurveFamily[] = [pow3];

/** The family called `name`; throws FitError listing the known names when there is none. */
export function findCurveFamily(name: string): CurveFamily {
  const family = curveFamilies.find((f) => f.name === name);
  if (family === undefined) {
    throw new FitError(
      `unknown curve family "${name}"; known families: ${curveFamilies.map((f) => f.name).join(", ")}`,
    );
  }
  return family;
}

export interface FamilyFit {
  family: CurveFamily;
  /** Parameters in oriented units (the family's own vector). */
  parameters: number[];
  /** Weighted residual sum of squares in oriented units. */
  residualSumOfSquares: number;
  covariance: number[][] | null;
  standardErrors: number[] | null;
  /** Starts tried and how many of them converged. */
  startsTried: number;
  startsConverged: number;
}

export interface FamilyFitOptions {
  /** Starting vectors tried before the family's own guesses. @default none */
  extraStarts?: readonly number[][];
  /** Starting vectors used instead of the family's own guesses. @default the family's guesses */
  startsOnly?: readonly number[][];
}

/**
 * Fits `family` to oriented points by weighted Levenberg–Marquardt from each of its starting
 * vectors (and any extra ones) within its bounds, and keeps the converged fit with the lowest
 * weighted RSS.
 *
 * @throws FitError when there are fewer points than parameters, a point is not finite, or no start
 *   converges (the message gives the family and the last reason).
 */
export function fitCurveFamily(
  family: CurveFamily,
  points: readonly OrientedPoint[],
  orientation: Orientation,
  options: FamilyFitOptions = {},
): FamilyFit {
  const p = family.parameterNames.length;
  if (points.length < p) {
    throw new FitError(`${family.name}: ${points.length} training sizes cannot determine ${p} parameters`);
  }
  for (const point of points) {
    if (
      !(point.trainingSize > 0) ||
      !Number.isFinite(point.trainingSize) ||
      !Number.isFinite(point.value) ||
      !(point.weight >= 0) ||
      !Number.isFinite(point.weight)
    ) {
      throw new FitError(
        `${family.name}: point at training size ${point.trainingSize} is not usable (value ${point.value}, weight ${point.weight})`,
      );
    }
  }
  const { lower, upper } = family.bounds(points, orientation);
  const starts = options.startsOnly ?? [...(options.extraStarts ?? []), ...family.initialGuesses(points)];
  const x = points.map((point) => point.trainingSize);
  const y = points.map((point) => point.value);
  const weights = points.map((point) => point.weight);
  let best: LeastSquaresResult | null = null;
  let converged = 0;
  let lastProblem = "no starting point";
  for (const start of starts) {
    let fit: LeastSquaresResult;
    try {
      fit = fitLeastSquares({
        model: family.model,
        jacobian: family.jacobian,
        x,
        y,
        weights,
        start,
        lowerBounds: lower,
        upperBounds: upper,
        maxIterations: 500,
      });
    } catch (error) {
      if (!(error instanceof FitError)) throw error;
      lastProblem = error.message;
      continue;
    }
    if (!fit.converged) {
      lastProblem = `no convergence in ${fit.iterations} iterations from [${start.join(", ")}]`;
      continue;
    }
    converged++;
    if (best === null || fit.residualSumOfSquares < best.residualSumOfSquares) best = fit;
  }
  if (best === null) {
    throw new FitError(`${family.name}: no fit converged from ${starts.length} starting points (${lastProblem})`);
  }
  return {
    family,
    parameters: best.parameters,
    residualSumOfSquares: best.residualSumOfSquares,
    covariance: best.covariance,
    standardErrors: best.standardErrors,
    startsTried: starts.length,
    startsConverged: converged,
  };
}

/** Weighted least-squares line y ≈ intercept + slope·x (closed form). */
function weightedLine(
  x: readonly number[],
  y: readonly number[],
  w: readonly number[],
): { intercept: number; slope: number } {
  let sw = 0;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i < x.length; i++) {
    sw += w[i];
    sx += w[i] * x[i];
    sy += w[i] * y[i];
  }
  const mx = sx / sw;
  const my = sy / sw;
  let sxx = 0;
  let sxy = 0;
  for (let i = 0; i < x.length; i++) {
    sxx += w[i] * (x[i] - mx) ** 2;
    sxy += w[i] * (x[i] - mx) * (y[i] - my);
  }
  const slope = sxx > 0 ? sxy / sxx : 0;
  return { intercept: my - slope * mx, slope };
}
