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
 * The families follow the learning-curve literature (Mohr, Viering, Loog and van Rijn 2022, "LCDB
 * 1.0: an extensive learning curves database for classification tasks", table of parametric models;
 * Domhan, Springenberg and Hutter 2015, "Speeding up automatic hyperparameter optimization of deep
 * neural networks by extrapolation of learning curves"): pow3, pow4, mmf4, wbl4, exp3 and ilog2,
 * plus `last`, the "no further gain" baseline that predicts the mean measured at the largest size.
 * Each is written for a rising curve, with bounds that keep it rising and its asymptote inside a
 * bounded metric's range. Adding a family means writing one more `CurveFamily` and listing it in
 * `curveFamilies`; the fitter and the forecast do not change.
 *
 * Starting points. Every family except ilog2 and last is linear in two of its parameters (an
 * asymptote and a scale) once the others are fixed, so each start fixes the nonlinear ones on a
 * small grid (exponents, or the size at which half the gain is made) and solves the weighted linear
 * regression for the other two, as pow3 does.
 */
import { FitError } from "../errors.js";
import { formatSignificant } from "../format.js";
import { message } from "../messages.js";
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
  /** The oriented value the curve tends to as n grows (its asymptote; ilog2's nominal limit c). */
  asymptote(parameters: readonly number[]): number;
  /**
   * Whether the family can be fitted to these points at all (ilog2 needs every size above 1, since
   * 1/ln n is infinite at n = 1). @default always
   */
  supports?(points: readonly OrientedPoint[]): boolean;
  /**
   * A closed-form fit used instead of Levenberg–Marquardt (the `last` baseline takes the value at the
   * largest size). @default none: the multi-start least-squares fit
   */
  directFit?(points: readonly OrientedPoint[]): number[];
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
  asymptote([a]) {
    return a;
  },
};

/** Exponents c and offsets d (in multiples of the smallest size) from which pow4 starts. */
const pow4StartExponents = [0.3, 0.6, 1, 2];
const pow4StartOffsets = [0, 1, 4];
/** pow4's offset d is kept in [0, this × the largest measured size]. */
const pow4LargestOffsetRatio = 10;
/** Shape exponents from which mmf4 and wbl4 start. */
const shapeStartExponents = [0.5, 1, 2];
/** mmf4's and wbl4's shape exponent d is kept in (0, 5]. */
const smallestShape = 1e-3;
const largestShape = 5;
/** mmf4's and wbl4's half-way size h is kept within these multiples of the smallest and largest size. */
const smallestHalfwayRatio = 1e-3;
const largestHalfwayRatio = 100;

/**
 * Largest gain a family may have between n = 0 (or 1) and its asymptote: the width of a bounded
 * metric's range (the curve cannot start below the range), else unbounded.
 */
function largestGain(orientation: Orientation): number {
  const range = orientedRange(orientation);
  return range === undefined ? Infinity : range[1] - range[0];
}

/** Bounds on a half-way size: [10⁻³ × smallest size, 100 × largest size]. */
function halfwayBounds(points: readonly OrientedPoint[]): [number, number] {
  const sizes = points.map((p) => p.trainingSize);
  return [smallestHalfwayRatio * Math.min(...sizes), largestHalfwayRatio * Math.max(...sizes)];
}

/**
 * pow4, the inverse power law with an offset (Mohr et al. 2022, LCDB): score `a − b·(n + d)^(−c)`
 * with asymptote a, b ≥ 0, exponent c in (0, 3] and offset d in [0, 10 × the largest measured size].
 * With d = 0 it is pow3; d > 0 flattens the smallest sizes.
 *
 * Fitted as the equal oriented form `a − g·((n + d)/(1 + d))^(−c)`, g = b·(1 + d)^(−c) being the gap
 * below the asymptote at n = 1, kept below the width of a bounded metric's range. Without that bound
 * noisy points send b to infinity along a valley where the curve turns into a straight line and the
 * fit never converges. The parameter vector is [a, g, c, d]; `scoreParameters` reports a, b, c, d.
 */
export const pow4: CurveFamily = {
  name: "pow4",
  parameterNames: ["a", "g", "c", "d"],
  formula:
    "score = a − b·(n + d)^(−c) when higher is better, a + b·(n + d)^(−c) when lower is better (a: asymptote, b ≥ 0, 0 < c ≤ 3, d ≥ 0)",
  model(n, [a, g, c, d]) {
    return a - g * Math.pow((n + d) / (1 + d), -c);
  },
  jacobian(n, [, g, c, d]) {
    const ratio = (n + d) / (1 + d);
    const power = Math.pow(ratio, -c);
    return [1, -power, g * power * Math.log(ratio), g * c * power * (1 / (n + d) - 1 / (1 + d))];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const starts: number[][] = [];
    for (const offsetRatio of pow4StartOffsets) {
      const d = offsetRatio * smallestSize;
      for (const c of pow4StartExponents) {
        const [a, g] = risingLine(points, (n) => Math.pow((n + d) / (1 + d), -c), smallestSize);
        starts.push([a, g, c, d]);
      }
    }
    return starts;
  },
  bounds(points, orientation) {
    const range = orientedRange(orientation);
    const largestSize = Math.max(1, ...points.map((p) => p.trainingSize));
    return {
      lower: [range?.[0] ?? -Infinity, 0, pow3SmallestExponent, 0],
      upper: [
        range?.[1] ?? Infinity,
        largestGain(orientation),
        pow3LargestExponent,
        pow4LargestOffsetRatio * largestSize,
      ],
    };
  },
  scoreParameters([a, g, c, d], orientation) {
    return { a: orientationSign(orientation) * a, b: g * Math.pow(1 + d, c), c, d };
  },
  asymptote([a]) {
    return a;
  },
};

/**
 * mmf4, the Morgan–Mercer–Flodin curve (Mohr et al. 2022, LCDB): score
 * `(a·b + c·n^d) / (b + n^d)`, rising from a at n = 0 to the asymptote c, half-way at n = b^(1/d).
 *
 * Fitted as the equal oriented form `c − g / (1 + (n/h)^d)` with the gain g = c − a in [0, width of
 * a bounded metric's range], the half-way size h = b^(1/d) in [10⁻³ × smallest, 100 × largest size],
 * shape d in (0, 5] and c inside a bounded metric's range: in these terms the bounds are boxes and
 * the fit is far better conditioned than in b, which spans powers of the sizes. The parameter vector
 * is [c, g, h, d]; `scoreParameters` reports the usual a, b, c, d.
 */
export const mmf4: CurveFamily = {
  name: "mmf4",
  parameterNames: ["c", "g", "h", "d"],
  formula:
    "score = (a·b + c·n^d) / (b + n^d) (c: asymptote, a: score at n = 0, b > 0, 0 < d ≤ 5; n = b^(1/d) is half-way)",
  model(n, [c, g, h, d]) {
    return c - g / (1 + Math.pow(n / h, d));
  },
  jacobian(n, [, g, h, d]) {
    const t = Math.pow(n / h, d);
    const q = 1 / (1 + t);
    return [1, -q, (-g * q * q * d * t) / h, g * q * q * t * Math.log(n / h)];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const starts: number[][] = [];
    for (const d of shapeStartExponents) {
      for (const halfway of halfwaySizes(points)) {
        // c − g·q(n) with q = 1 / (1 + (n/h)^d): a line in q.
        const basis = (n: number) => 1 / (1 + Math.pow(n / halfway, d));
        const [c, g] = risingLine(points, basis, smallestSize);
        starts.push([c, g, halfway, d]);
      }
    }
    return starts;
  },
  bounds(points, orientation) {
    const range = orientedRange(orientation);
    const [smallestHalfway, largestHalfway] = halfwayBounds(points);
    return {
      lower: [range?.[0] ?? -Infinity, 0, smallestHalfway, smallestShape],
      upper: [range?.[1] ?? Infinity, largestGain(orientation), largestHalfway, largestShape],
    };
  },
  scoreParameters([c, g, h, d], orientation) {
    const sign = orientationSign(orientation);
    return { a: sign * (c - g), b: Math.pow(h, d), c: sign * c, d };
  },
  asymptote([c]) {
    return c;
  },
};

/**
 * wbl4, the Weibull curve (Mohr et al. 2022, LCDB; Domhan et al. 2015): score `c − b·exp(−a·n^d)`
 * with asymptote c, b ≥ 0, rate a ≥ 0 and shape d in (0, 5].
 *
 * Fitted as the equal oriented form `c − b·exp(−(n/h)^d)` with a = h^(−d), the size h in
 * [10⁻³ × smallest, 100 × largest size] and b no larger than the width of a bounded metric's range
 * (the curve cannot start below the range); as for mmf4 this keeps the bounds boxes and the fit
 * conditioned. The parameter vector is [h, b, c, d]; `scoreParameters` reports a, b, c, d.
 */
export const wbl4: CurveFamily = {
  name: "wbl4",
  parameterNames: ["h", "b", "c", "d"],
  formula:
    "score = c − b·exp(−a·n^d) when higher is better, c + b·exp(−a·n^d) when lower is better (c: asymptote, a ≥ 0, b ≥ 0, 0 < d ≤ 5)",
  model(n, [h, b, c, d]) {
    return c - b * Math.exp(-Math.pow(n / h, d));
  },
  jacobian(n, [h, b, , d]) {
    const t = Math.pow(n / h, d);
    const decay = Math.exp(-t);
    return [(-b * decay * d * t) / h, -decay, 1, b * decay * t * Math.log(n / h)];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const starts: number[][] = [];
    for (const d of shapeStartExponents) {
      for (const halfway of halfwaySizes(points)) {
        const basis = (n: number) => Math.exp(-Math.pow(n / halfway, d));
        const [c, b] = risingLine(points, basis, smallestSize);
        starts.push([halfway, b, c, d]);
      }
    }
    return starts;
  },
  bounds(points, orientation) {
    const range = orientedRange(orientation);
    const [smallestHalfway, largestHalfway] = halfwayBounds(points);
    return {
      lower: [smallestHalfway, 0, range?.[0] ?? -Infinity, smallestShape],
      upper: [largestHalfway, largestGain(orientation), range?.[1] ?? Infinity, largestShape],
    };
  },
  scoreParameters([h, b, c, d], orientation) {
    return { a: Math.pow(h, -d), b, c: orientationSign(orientation) * c, d };
  },
  asymptote([, , c]) {
    return c;
  },
};

/**
 * exp3, the exponential curve (Mohr et al. 2022, LCDB; Domhan et al. 2015): oriented value
 * `c − a·exp(−b·n)` with asymptote c, a ≥ 0 (no larger than the width of a bounded metric's range)
 * and rate b ≥ 0. It saturates fast: beyond a few half-way sizes it predicts almost no further gain.
 */
export const exp3: CurveFamily = {
  name: "exp3",
  parameterNames: ["a", "b", "c"],
  formula:
    "score = c − a·exp(−b·n) when higher is better, c + a·exp(−b·n) when lower is better (c: asymptote, a ≥ 0, b ≥ 0)",
  model(n, [a, b, c]) {
    return c - a * Math.exp(-b * n);
  },
  jacobian(n, [a, b]) {
    const decay = Math.exp(-b * n);
    return [-decay, a * n * decay, 1];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const largestSize = Math.max(...points.map((p) => p.trainingSize));
    return [...halfwaySizes(points), 3 * largestSize].map((halfway) => {
      const b = Math.LN2 / halfway;
      const [c, a] = risingLine(points, (n) => Math.exp(-b * n), smallestSize, Math.exp(-b * smallestSize));
      return [a, b, c];
    });
  },
  bounds(_points, orientation) {
    const range = orientedRange(orientation);
    return {
      lower: [0, 0, range?.[0] ?? -Infinity],
      upper: [largestGain(orientation), Infinity, range?.[1] ?? Infinity],
    };
  },
  scoreParameters([a, b, c], orientation) {
    return { a, b, c: orientationSign(orientation) * c };
  },
  asymptote([, , c]) {
    return c;
  },
};

/**
 * ilog2, the inverse logarithm (Mohr et al. 2022, LCDB): oriented value `c − a / ln n` with a ≥ 0
 * and c inside a bounded metric's range. It keeps rising, ever more slowly, and reaches c only as
 * n → ∞; it needs every training size above 1.
 */
export const ilog2: CurveFamily = {
  name: "ilog2",
  parameterNames: ["a", "c"],
  formula:
    "score = c − a / ln n when higher is better, c + a / ln n when lower is better (a ≥ 0; c is reached only as n → ∞)",
  model(n, [a, c]) {
    return c - a / Math.log(n);
  },
  jacobian(n) {
    return [-1 / Math.log(n), 1];
  },
  initialGuesses(points) {
    const smallestSize = Math.min(...points.map((p) => p.trainingSize));
    const [c, a] = risingLine(points, (n) => 1 / Math.log(n), smallestSize, 1 / Math.log(smallestSize));
    return [[a, c]];
  },
  bounds(_points, orientation) {
    const range = orientedRange(orientation);
    return { lower: [0, range?.[0] ?? -Infinity], upper: [Infinity, range?.[1] ?? Infinity] };
  },
  scoreParameters([a, c], orientation) {
    return { a, c: orientationSign(orientation) * c };
  },
  asymptote([, c]) {
    return c;
  },
  supports(points) {
    return points.every((p) => p.trainingSize > 1);
  },
};

/**
 * last, the "no further gain" baseline: the mean score measured at the largest training size, at
 * every larger size. It is the forecast to beat (a learning curve that cannot predict held-back
 * sizes better than this has nothing to say about larger ones).
 */
export const last: CurveFamily = {
  name: "last",
  parameterNames: ["a"],
  formula: "score = the mean measured at the largest training size (no further gain)",
  model(_n, [a]) {
    return a;
  },
  jacobian() {
    return [1];
  },
  initialGuesses(points) {
    return [lastValue(points)];
  },
  bounds(_points, orientation) {
    const range = orientedRange(orientation);
    return { lower: [range?.[0] ?? -Infinity], upper: [range?.[1] ?? Infinity] };
  },
  scoreParameters([a], orientation) {
    return { a: orientationSign(orientation) * a };
  },
  asymptote([a]) {
    return a;
  },
  directFit(points) {
    return lastValue(points);
  },
};

function lastValue(points: readonly OrientedPoint[]): number[] {
  let largest = points[0];
  for (const point of points) if (point.trainingSize > largest.trainingSize) largest = point;
  return [largest.value];
}

/** Sizes at which mmf4, wbl4 and exp3 start with half their gain made: smallest, middle, largest. */
function halfwaySizes(points: readonly OrientedPoint[]): number[] {
  const sizes = points.map((p) => p.trainingSize);
  const smallest = Math.min(...sizes);
  const largest = Math.max(...sizes);
  return [smallest, Math.sqrt(smallest * largest), largest];
}

/**
 * Starting asymptote and scale of a family `asymptote − scale·basis(n)` from the weighted regression
 * of the values on basis(n), with the scale made positive when the points do not rise (then a
 * gentle rise up to the best value, the basis at the smallest size being `basisAtSmallest`).
 */
function risingLine(
  points: readonly OrientedPoint[],
  basis: (n: number) => number,
  smallestSize: number,
  basisAtSmallest = basis(smallestSize),
): [number, number] {
  const values = points.map((p) => p.value);
  const line = weightedLine(
    points.map((p) => basis(p.trainingSize)),
    values,
    points.map((p) => p.weight),
  );
  let asymptote = line.intercept;
  let scale = -line.slope;
  if (!(scale > 0) || !Number.isFinite(asymptote) || !Number.isFinite(scale)) {
    const spread = Math.max(Math.max(...values) - Math.min(...values), 1e-6 * Math.max(1, ...values.map(Math.abs)));
    asymptote = Math.max(...values);
    scale = (0.5 * spread) / Math.max(basisAtSmallest, Number.MIN_VALUE);
  }
  return [asymptote, scale];
}

/** Every family the fitter knows, in the order they are tried or listed. */
export const curveFamilies: readonly CurveFamily[] = [pow3, pow4, mmf4, wbl4, exp3, ilog2, last];

/** The family called `name`; throws FitError listing the known names when there is none. */
export function findCurveFamily(name: string): CurveFamily {
  const family = curveFamilies.find((f) => f.name === name);
  if (family === undefined) {
    throw new FitError(
      message.unknownFamily(
        name,
        curveFamilies.map((f) => f.name),
      ),
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
 * weighted RSS. A family with a closed-form fit (`directFit`, the `last` baseline) skips the
 * iteration.
 *
 * @throws FitError when there are fewer points than parameters, a point is not finite, the family
 *   does not support the sizes (ilog2 at n = 1), or no start converges (the message gives the family
 *   and the last reason).
 */
export function fitCurveFamily(
  family: CurveFamily,
  points: readonly OrientedPoint[],
  orientation: Orientation,
  options: FamilyFitOptions = {},
): FamilyFit {
  const p = family.parameterNames.length;
  if (points.length < p) {
    throw new FitError(message.familyTooFewSizes(family.name, points.length, p));
  }
  for (const point of points) {
    if (
      !(point.trainingSize > 0) ||
      !Number.isFinite(point.trainingSize) ||
      !Number.isFinite(point.value) ||
      !(point.weight >= 0) ||
      !Number.isFinite(point.weight)
    ) {
      throw new FitError(message.familyPointUnusable(family.name, point.trainingSize, point.value, point.weight));
    }
  }
  if (family.supports !== undefined && !family.supports(points)) {
    throw new FitError(message.familyUnsupportedSizes(family.name, family.formula));
  }
  const { lower, upper } = family.bounds(points, orientation);
  if (family.directFit !== undefined) {
    const parameters = family.directFit(points).map((value, j) => Math.min(upper[j], Math.max(lower[j], value)));
    let residualSumOfSquares = 0;
    for (const point of points)
      residualSumOfSquares += point.weight * (family.model(point.trainingSize, parameters) - point.value) ** 2;
    return {
      family,
      parameters,
      residualSumOfSquares,
      covariance: null,
      standardErrors: null,
      startsTried: 1,
      startsConverged: 1,
    };
  }
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
      // The start to 4 significant digits: the message reaches the report's warnings.
      lastProblem = `no convergence in ${fit.iterations} iterations from [${start.map((v) => formatSignificant(v)).join(", ")}]`;
      continue;
    }
    converged++;
    if (best === null || fit.residualSumOfSquares < best.residualSumOfSquares) best = fit;
  }
  if (best === null) {
    throw new FitError(message.familyNotConverged(family.name, starts.length, lastProblem));
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
