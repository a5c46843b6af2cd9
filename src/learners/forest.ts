/**
 * Random forest classifier (`--learner forest`).
 *
 * Breiman's random forest (Breiman 2001, "Random forests") as scikit-learn's
 * `RandomForestClassifier()` grows it by default:
 *  - each of `trees` trees is grown on a bootstrap sample of the training rows (n draws with
 *    replacement; a row drawn m times weighs m, as scikit-learn's sample weights);
 *  - at each node the features are visited in a random order until ⌊√p⌋ have been visited and at
 *    least one of them is not constant in the node (a constant feature counts as visited, as in
 *    scikit-learn's BestSplitter); each visited feature's best threshold is the midpoint between two
 *    consecutive distinct values (values closer than 1e-7 count as equal) that most reduces the
 *    weighted Gini impurity, rows at or below it going left;
 *  - a node becomes a leaf when it is pure, holds fewer than 2 distinct rows, cannot leave
 *    `minSamplesLeaf` distinct rows on each side, or lies at `maxDepth` (0: no limit, trees grown
 *    fully as scikit-learn's default);
 *  - a leaf holds the weighted class fractions of its rows; the forest's probabilities are the mean
 *    of the trees' leaf fractions, as scikit-learn's `predict_proba`.
 * The features are imputed and text columns one-hot encoded by the {@link Preprocessor}, but not
 * standardized: a tree only compares values within a column. All randomness (bootstrap draws, feature
 * orders) comes from the given stream, so a fit is reproducible from the seed; it cannot reproduce
 * scikit-learn's trees number for number, whose random streams differ.
 *
 * Written by hand because the npm package ml-random-forest's `predictProbability` drops one tree's
 * vote and crashes on few trees without `noOOB`, and ml-cart takes seconds on 2000 × 60 rows × columns (found
 * when tried). Here each node sorts its rows' values per visited feature (a counting sort on ranks
 * found once per fit, or in small nodes quicksort with three-way partitioning on parallel
 * Float64Array/Int32Array), and class weights are
 * whole numbers, so the Gini comparisons are exact.
 */
import type { RandomStream } from "../random.js";
import type { FittedModel, Learner, LearnerSettings, TrainingSet } from "./learner.js";
import { fitPreprocessor, type Preprocessor } from "./preprocess.js";
import { scratchDoubles, scratchRowDoubles, scratchRowIntegers } from "./scratch.js";
import { checkSettingNames, wholeNumber } from "./settings.js";
import { spreadOverClasses } from "./classProbabilities.js";
import { summarizeClasses } from "./trainingChecks.js";

export interface ForestOptions {
  /** Number of trees (scikit-learn's `n_estimators`). @default 100 */
  trees?: number;
  /** Deepest level a node may lie at, the root being level 0; 0 means no limit. @default 0 */
  maxDepth?: number;
  /** Fewest distinct training rows each side of a split must keep (scikit-learn's `min_samples_leaf`). @default 1 */
  minSamplesLeaf?: number;
}

export type ResolvedForestOptions = Required<ForestOptions>;

const name = "forest";

/** Two values closer than this count as equal when placing thresholds (scikit-learn's FEATURE_THRESHOLD). */
const featureThreshold = 1e-7;

/**
 * A node orders its rows by a feature with a counting sort on the ranks once it holds at least this
 * fraction of the feature's distinct values: the counting sort takes time in rows + distinct values,
 * the comparison sort in rows · log rows with unpredictable branches, and they cross near an eighth
 * on the hundred or two rows of a learning curve's fits. Either gives the same tree: rows with equal
 * values may come in another order, but a split, its threshold and a leaf's class weights depend only
 * on which rows fall on each side (the weights are whole numbers, summed exactly).
 */
const countingSortShare = 1 / 8;

/** Depth limits the tuning step tries; 0 grows the trees fully. */
export const forestTuningGrid: readonly LearnerSettings[] = [
  { maxDepth: 2 },
  { maxDepth: 4 },
  { maxDepth: 8 },
  { maxDepth: 16 },
  { maxDepth: 0 },
];

/**
 * Fills in the defaults of {@link ForestOptions}.
 * @throws UsageError when trees or minSamplesLeaf is not a whole number of at least 1, or maxDepth not
 *   a whole number of at least 0.
 */
export function resolveForestOptions(options: ForestOptions = {}): ResolvedForestOptions {
  return {
    trees: wholeNumber(name, "trees", options.trees ?? 100, 1),
    maxDepth: wholeNumber(name, "maxDepth", options.maxDepth ?? 0, 0),
    minSamplesLeaf: wholeNumber(name, "minSamplesLeaf", options.minSamplesLeaf ?? 1, 1),
  };
}

/** The random-forest learner. */
export class RandomForest implements Learner {
  readonly name = name;
  readonly options: ResolvedForestOptions;
  readonly tuningGrid = forestTuningGrid;

  constructor(options: ForestOptions = {}) {
    this.options = resolveForestOptions(options);
  }

  /** @throws UsageError on a setting other than `trees`, `maxDepth`, `minSamplesLeaf` or a bad value. */
  withOptions(settings: LearnerSettings): RandomForest {
    checkSettingNames(name, settings, ["trees", "maxDepth", "minSamplesLeaf"]);
    return new RandomForest({ ...this.options, ...settings });
  }

  /**
   * Fits the imputation and encoding, then grows the trees.
   * @throws DataError on a malformed training set (see {@link summarizeClasses}) or a ±Infinity feature.
   */
  fit(training: TrainingSet, random: RandomStream): FittedForest {
    const { present, positions } = summarizeClasses(name, training);
    const { features, rows, classCount } = training;
    const preprocessor = fitPreprocessor(features, rows, training.columns, {
      categories: training.categories,
      completeColumns: training.completeColumns,
      standardize: false,
    });
    const p = preprocessor.outputColumns;
    // The imputed rows and their ranked copy serve only while the trees grow: work arrays of this
    // thread (scratch.ts), as large as the training rows, reused by the next fit instead of piling up
    // as garbage that V8 collects late.
    // Complete numeric columns (the usual case) come through the unstandardized step unchanged.
    const x = preprocessor.passesThrough(features)
      ? features
      : preprocessor.transform(features, rows, scratchRowDoubles("forest.training", rows, p));
    const grower = new TreeGrower(rankFeatures(x, rows, p), rows, p, positions, present.length, this.options, random);
    for (let t = 0; t < this.options.trees; t++) grower.grow();
    return new FittedForest(classCount, preprocessor, present, grower.finish());
  }
}

/**
 * The trees in flat arrays, one after another: a handful of arrays per forest rather than a handful
 * per tree (thousands of small allocations per fit, which fragment the process's memory).
 */
interface Trees {
  /** Where each tree's nodes start, then the total: tree t's root is node `roots[t]`. */
  roots: Int32Array;
  /** Split feature of each node, −1 for a leaf. */
  feature: Int32Array;
  threshold: Float64Array;
  /** Child nodes of each inner node; for a leaf, `left` is the leaf's row in `values`. */
  left: Int32Array;
  right: Int32Array;
  /** Row-major `leaves × classes`: the leaves' class fractions over the present classes. */
  values: Float64Array;
}

/** A fitted random forest. */
export class FittedForest implements FittedModel {
  constructor(
    /** Number of classes in the whole data set: the width of the probability rows. */
    readonly classCount: number,
    /** The encoding and imputation fitted on the training rows. */
    readonly preprocessor: Preprocessor,
    /** The classes present in training, ascending; the others get probability 0. */
    readonly classes: Int32Array,
    private readonly trees: Trees,
  ) {}

  /** Number of trees. */
  get treeCount(): number {
    return this.trees.roots.length - 1;
  }

  /** Number of nodes of each tree. */
  nodeCounts(): number[] {
    const { roots } = this.trees;
    return Array.from({ length: roots.length - 1 }, (_, t) => roots[t + 1] - roots[t]);
  }

  /**
   * Class probabilities, row-major `rows × classCount`: the mean over the trees of the class
   * fractions in the leaf each row reaches.
   * @throws DataError when the features do not hold rows × columns values or a value is ±Infinity.
   */
  predictProbabilities(features: Float64Array, rows: number): Float64Array {
    const p = this.preprocessor.outputColumns;
    const x = this.preprocessor.transform(features, rows, scratchDoubles("forest.predicted", rows * p));
    const classes = this.classes.length;
    const out = new Float64Array(rows * classes);
    const { roots, feature, threshold, left, right, values } = this.trees;
    const count = roots.length - 1;
    for (let t = 0; t < count; t++) {
      for (let i = 0; i < rows; i++) {
        const offset = i * p;
        let node = roots[t];
        while (feature[node] >= 0) node = x[offset + feature[node]] <= threshold[node] ? left[node] : right[node];
        const leaf = left[node] * classes;
        for (let k = 0; k < classes; k++) out[i * classes + k] += values[leaf + k];
      }
    }
    for (let i = 0; i < out.length; i++) out[i] /= count;
    return spreadOverClasses(out, rows, this.classes, this.classCount);
  }
}

/**
 * The training features column by column, with each value's rank among its column's distinct values.
 * Its arrays are work arrays of this thread (scratch.ts): valid only while one fit grows its trees.
 */
interface RankedFeatures {
  /** Column-major `columns × rows` values. */
  values: Float64Array;
  /** Column-major `columns × rows`: the rank of each row's value among its column's distinct values. */
  ranks: Int32Array;
  /** Number of distinct values of each column. */
  distinctCounts: Int32Array;
  /** The distinct values of all columns, each column's ascending, concatenated (then unused room). */
  distinctValues: Float64Array;
  /** Where each column's distinct values start in `distinctValues`. */
  offsets: Int32Array;
}

/**
 * Sorts every column once per fit. A node holding enough rows for a feature's distinct values (see
 * {@link countingSortShare}: indicator and small-integer features, and the nodes near the root) then
 * orders its rows by that feature with a counting sort on the ranks; other nodes sort the values
 * themselves.
 */
function rankFeatures(x: Float64Array, rows: number, columns: number): RankedFeatures {
  const values = scratchRowDoubles("forest.values", rows, columns);
  const ranks = scratchRowIntegers("forest.ranks", rows, columns);
  const distinctCounts = new Int32Array(columns);
  const offsets = new Int32Array(columns);
  // At most `rows` distinct values per column.
  const distinctValues = scratchRowDoubles("forest.distinct", rows, columns);
  const sorted = scratchRowDoubles("forest.sorted", rows);
  const order = scratchRowIntegers("forest.order", rows);
  let distinct = 0;
  for (let j = 0; j < columns; j++) {
    offsets[j] = distinct;
    for (let i = 0; i < rows; i++) {
      const v = x[i * columns + j];
      values[j * rows + i] = v;
      sorted[i] = v;
      order[i] = i;
    }
    sortTogether(sorted, order, 0, rows);
    let rank = -1;
    for (let s = 0; s < rows; s++) {
      if (s === 0 || sorted[s] !== sorted[s - 1]) {
        rank++;
        distinctValues[distinct++] = sorted[s];
      }
      ranks[j * rows + order[s]] = rank;
    }
    distinctCounts[j] = rank + 1;
  }
  return { values, ranks, distinctCounts, distinctValues, offsets };
}

/** Grows trees on one training set; holds the work arrays they share. */
class TreeGrower {
  private readonly maxFeatures: number;
  private readonly weights: Float64Array;
  private readonly samples: Int32Array;
  private readonly values: Float64Array;
  private readonly reordered: Int32Array;
  private readonly bucketStarts: Int32Array;
  private readonly featureOrder: Int32Array;
  private readonly nodeCounts: Float64Array;
  private readonly leftCounts: Float64Array;
  private readonly rightCounts: Float64Array;
  /** The trees grown so far, one after another, in arrays with room for `trees` trees of the most nodes. */
  private readonly grown: Trees;
  private treeCount = 0;
  private nodeCount = 0;
  private leafCount = 0;

  constructor(
    private readonly features: RankedFeatures,
    private readonly rows: number,
    private readonly columns: number,
    /** Each row's class over the present classes. */
    private readonly labels: Int32Array,
    private readonly classes: number,
    private readonly options: ResolvedForestOptions,
    private readonly random: RandomStream,
  ) {
    this.maxFeatures = Math.max(1, Math.floor(Math.sqrt(columns)));
    this.weights = new Float64Array(rows);
    this.samples = new Int32Array(rows);
    this.values = new Float64Array(rows);
    this.reordered = new Int32Array(rows);
    let mostDistinct = 0;
    for (let j = 0; j < columns; j++) mostDistinct = Math.max(mostDistinct, features.distinctCounts[j]);
    this.bucketStarts = new Int32Array(mostDistinct + 1);
    this.featureOrder = new Int32Array(columns);
    this.nodeCounts = new Float64Array(classes);
    this.leftCounts = new Float64Array(classes);
    this.rightCounts = new Float64Array(classes);
    // A tree on at most `rows` distinct rows has fewer than 2 · rows nodes, at most `rows` of them leaves.
    const nodesPerRow = 2 * options.trees;
    this.grown = {
      roots: new Int32Array(options.trees + 1),
      feature: scratchRowIntegers("forest.feature", rows, nodesPerRow),
      threshold: scratchRowDoubles("forest.threshold", rows, nodesPerRow),
      left: scratchRowIntegers("forest.left", rows, nodesPerRow),
      right: scratchRowIntegers("forest.right", rows, nodesPerRow),
      values: scratchRowDoubles("forest.leafValues", rows, options.trees * classes),
    };
  }

  /** The trees grown, in arrays of their own (the work arrays go back to the thread). */
  finish(): Trees {
    const { grown, treeCount, nodeCount } = this;
    return {
      roots: grown.roots.slice(0, treeCount + 1),
      feature: grown.feature.slice(0, nodeCount),
      threshold: grown.threshold.slice(0, nodeCount),
      left: grown.left.slice(0, nodeCount),
      right: grown.right.slice(0, nodeCount),
      values: grown.values.slice(0, this.leafCount * this.classes),
    };
  }

  /** Draws a bootstrap sample and grows one tree on it, depth first, after the trees grown before. */
  grow(): void {
    const { rows, classes, weights, samples, random } = this;
    weights.fill(0);
    for (let draw = 0; draw < rows; draw++) weights[random.integer(rows)]++;
    let distinct = 0;
    for (let i = 0; i < rows; i++) if (weights[i] > 0) samples[distinct++] = i;

    const { feature, threshold, left, right, values: leafValues, roots } = this.grown;
    // Nodes and leaves are numbered after the trees grown before.
    let nodes = this.nodeCount;
    let leaves = this.leafCount;
    roots[this.treeCount] = nodes;
    // Stack of nodes to grow: start, end, depth, node index.
    const stack: number[] = [0, distinct, 0, nodes++];
    while (stack.length > 0) {
      const node = stack.pop()!;
      const depth = stack.pop()!;
      const end = stack.pop()!;
      const start = stack.pop()!;
      const split = this.bestSplit(start, end, depth);
      if (split === null) {
        feature[node] = -1;
        threshold[node] = 0;
        left[node] = leaves;
        right[node] = 0;
        const total = this.totalWeight;
        for (let k = 0; k < classes; k++) leafValues[leaves * classes + k] = this.nodeCounts[k] / total;
        leaves++;
        continue;
      }
      const middle = this.partition(start, end, split.feature, split.threshold);
      feature[node] = split.feature;
      threshold[node] = split.threshold;
      left[node] = nodes++;
      right[node] = nodes++;
      stack.push(middle, end, depth + 1, right[node]);
      stack.push(start, middle, depth + 1, left[node]);
    }
    this.treeCount++;
    this.nodeCount = nodes;
    this.leafCount = leaves;
    roots[this.treeCount] = nodes;
  }

  /** Weighted row count of the node last examined by bestSplit. */
  private totalWeight = 0;

  /**
   * The best split of samples[start, end), or null when the node is a leaf. Leaves the node's class
   * weights in `nodeCounts` and their sum in `totalWeight`.
   */
  private bestSplit(start: number, end: number, depth: number): { feature: number; threshold: number } | null {
    const { classes, labels, weights, samples, nodeCounts, leftCounts, rightCounts, options } = this;
    nodeCounts.fill(0);
    let total = 0;
    for (let s = start; s < end; s++) {
      const w = weights[samples[s]];
      nodeCounts[labels[samples[s]]] += w;
      total += w;
    }
    this.totalWeight = total;
    const size = end - start;
    if (size < 2 || size < 2 * options.minSamplesLeaf) return null;
    if (options.maxDepth > 0 && depth >= options.maxDepth) return null;
    let squares = 0;
    for (let k = 0; k < classes; k++) squares += nodeCounts[k] * nodeCounts[k];
    // Gini impurity 1 − Σ (nₖ/n)²; a pure node (impurity ≤ machine epsilon) is a leaf.
    if (1 - squares / (total * total) <= Number.EPSILON) return null;

    const { columns, featureOrder, maxFeatures, random, values } = this;
    const minLeaf = options.minSamplesLeaf;
    for (let j = 0; j < columns; j++) featureOrder[j] = j;
    let bestProxy = -Infinity;
    let bestFeature = -1;
    let bestThreshold = 0;
    let visited = 0;
    let nonConstant = 0;
    for (let drawn = 0; drawn < columns && (visited < maxFeatures || nonConstant === 0); drawn++) {
      const pick = drawn + random.integer(columns - drawn);
      const f = featureOrder[pick];
      featureOrder[pick] = featureOrder[drawn];
      featureOrder[drawn] = f;
      visited++;
      this.sortByFeature(f, start, end);
      if (values[end - 1] <= values[start] + featureThreshold) continue; // constant in this node
      nonConstant++;
      leftCounts.fill(0);
      rightCounts.set(nodeCounts);
      let leftWeight = 0;
      let rightWeight = total;
      let leftSquares = 0;
      let rightSquares = squares;
      for (let position = start + 1; position < end; position++) {
        // Move sample position − 1 to the left side.
        const moved = samples[position - 1];
        const w = weights[moved];
        const c = labels[moved];
        leftSquares += w * (2 * leftCounts[c] + w);
        rightSquares -= w * (2 * rightCounts[c] - w);
        leftCounts[c] += w;
        rightCounts[c] -= w;
        leftWeight += w;
        rightWeight -= w;
        if (values[position] <= values[position - 1] + featureThreshold) continue;
        if (position - start < minLeaf || end - position < minLeaf) continue;
        // Maximizing Σ nₗₖ²/nₗ + Σ nᵣₖ²/nᵣ minimizes the children's weighted Gini impurity.
        const proxy = leftSquares / leftWeight + rightSquares / rightWeight;
        if (proxy > bestProxy) {
          bestProxy = proxy;
          bestFeature = f;
          let t = values[position - 1] / 2 + values[position] / 2;
          if (t === values[position] || !Number.isFinite(t)) t = values[position - 1];
          bestThreshold = t;
        }
      }
    }
    return bestFeature < 0 ? null : { feature: bestFeature, threshold: bestThreshold };
  }

  /** Orders samples[start, end) by the feature's value, and puts the values in values[start, end). */
  private sortByFeature(feature: number, start: number, end: number): void {
    const { samples, values, rows } = this;
    const column = feature * rows;
    const distinctCount = this.features.distinctCounts[feature];
    if (end - start < distinctCount * countingSortShare) {
      const x = this.features.values;
      for (let s = start; s < end; s++) values[s] = x[column + samples[s]];
      sortTogether(values, samples, start, end);
      return;
    }
    // Counting sort on the ranks.
    const { ranks, distinctValues, offsets } = this.features;
    const { reordered, bucketStarts } = this;
    bucketStarts.fill(0, 0, distinctCount + 1);
    for (let s = start; s < end; s++) bucketStarts[ranks[column + samples[s]] + 1]++;
    for (let r = 0; r < distinctCount; r++) bucketStarts[r + 1] += bucketStarts[r];
    for (let s = start; s < end; s++) {
      const sample = samples[s];
      reordered[bucketStarts[ranks[column + sample]]++] = sample;
    }
    const base = offsets[feature];
    for (let s = start; s < end; s++) {
      const sample = reordered[s - start];
      samples[s] = sample;
      values[s] = distinctValues[base + ranks[column + sample]];
    }
  }

  /** Reorders samples[start, end) so the rows with feature ≤ threshold come first; returns their end. */
  private partition(start: number, end: number, feature: number, threshold: number): number {
    const { samples } = this;
    const x = this.features.values;
    const column = feature * this.rows;
    let i = start;
    let j = end - 1;
    while (i <= j) {
      if (x[column + samples[i]] <= threshold) i++;
      else {
        const t = samples[i];
        samples[i] = samples[j];
        samples[j] = t;
        j--;
      }
    }
    return i;
  }
}

/**
 * Sorts values[start, end) ascending and applies the same permutation to items[start, end):
 * quicksort with a median-of-three pivot and three-way partitioning (fast on the many equal values of
 * a tree's features), insertion sort below 16 elements, heapsort beyond 2·log₂ n levels (introsort,
 * Musser 1997, as scikit-learn's splitter sorts).
 */
export function sortTogether(values: Float64Array, items: Int32Array, start: number, end: number): void {
  const n = end - start;
  if (n < 2) return;
  introsort(values, items, start, end, 2 * Math.floor(Math.log2(n)));
}

function introsort(values: Float64Array, items: Int32Array, start: number, end: number, depthLimit: number): void {
  while (end - start > 16) {
    if (depthLimit === 0) {
      heapsort(values, items, start, end);
      return;
    }
    depthLimit--;
    const a = values[start];
    const b = values[(start + end) >> 1];
    const c = values[end - 1];
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    // Three-way partition: [start, lt) < pivot, [lt, i) = pivot, (gt, end) > pivot.
    let lt = start;
    let i = start;
    let gt = end - 1;
    while (i <= gt) {
      const v = values[i];
      if (v < pivot) {
        swap(values, items, i++, lt++);
      } else if (v > pivot) {
        swap(values, items, i, gt--);
      } else {
        i++;
      }
    }
    // Recurse into the smaller side, loop on the larger.
    if (lt - start < end - gt - 1) {
      introsort(values, items, start, lt, depthLimit);
      start = gt + 1;
    } else {
      introsort(values, items, gt + 1, end, depthLimit);
      end = lt;
    }
  }
  for (let i = start + 1; i < end; i++) {
    const v = values[i];
    const item = items[i];
    let j = i - 1;
    while (j >= start && values[j] > v) {
      values[j + 1] = values[j];
      items[j + 1] = items[j];
      j--;
    }
    values[j + 1] = v;
    items[j + 1] = item;
  }
}

function swap(values: Float64Array, items: Int32Array, i: number, j: number): void {
  const v = values[i];
  values[i] = values[j];
  values[j] = v;
  const t = items[i];
  items[i] = items[j];
  items[j] = t;
}

function heapsort(values: Float64Array, items: Int32Array, start: number, end: number): void {
  const n = end - start;
  const siftDown = (root: number, size: number) => {
    for (;;) {
      let child = 2 * root + 1;
      if (child >= size) return;
      if (child + 1 < size && values[start + child + 1] > values[start + child]) child++;
      if (values[start + root] >= values[start + child]) return;
      swap(values, items, start + root, start + child);
      root = child;
    }
  };
  for (let i = (n >> 1) - 1; i >= 0; i--) siftDown(i, n);
  for (let size = n - 1; size > 0; size--) {
    swap(values, items, start, start + size);
    siftDown(0, size);
  }
}
