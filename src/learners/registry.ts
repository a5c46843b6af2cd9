/**
 * Learners by name, so that the command line and worker threads can create them from plain data.
 * Classification learners (`createLearner`) and learners for numeric targets
 * (`createRegressionLearner`) have separate names and lists; no name is in both.
 */
import type { Learner, RegressionLearner } from "./learner.js";
import { RandomForest } from "./forest.js";
import { KNearestNeighbors } from "./knn.js";
import { KNearestNeighborsRegression } from "./knnRegression.js";
import { LinearDiscriminant } from "./lda.js";
import { LogisticRegression } from "./logistic.js";
import { GaussianNaiveBayes } from "./naiveBayes.js";
import { RidgeRegression } from "./ridge.js";
import { releaseScratch } from "./scratch.js";
import { releaseKernelMemory } from "../numerics/wasm.js";
import { LinearSvm } from "./svm.js";

const factories: Record<string, () => Learner> = {
  logistic: () => new LogisticRegression(),
  lda: () => new LinearDiscriminant(),
  "naive-bayes": () => new GaussianNaiveBayes(),
  knn: () => new KNearestNeighbors(),
  forest: () => new RandomForest(),
  svm: () => new LinearSvm(),
};

const regressionFactories: Record<string, () => RegressionLearner> = {
  ridge: () => new RidgeRegression(),
  "knn-regression": () => new KNearestNeighborsRegression(),
};

/** Names of the classification learners available. */
export function learnerNames(): string[] {
  return Object.keys(factories);
}

/** Names of the learners for numeric targets available. */
export function regressionLearnerNames(): string[] {
  return Object.keys(regressionFactories);
}

/**
 * Adds a classification learner under a new name, for this thread only (worker threads build their
 * own registry from this module, so a learner registered at run time is available with one worker
 * only). Tests use it for a fake learner whose score is a known function of the training size.
 */
export function registerLearner(name: string, factory: () => Learner): void {
  factories[name] = factory;
}

/** Adds a learner for numeric targets under a new name, for this thread only (as {@link registerLearner}). */
export function registerRegressionLearner(name: string, factory: () => RegressionLearner): void {
  regressionFactories[name] = factory;
}

/** A fresh classification learner of that name, or undefined when the name is unknown. */
export function createLearner(name: string): Learner | undefined {
  return Object.hasOwn(factories, name) ? factories[name]() : undefined;
}

/** A fresh learner for numeric targets of that name, or undefined when the name is unknown. */
export function createRegressionLearner(name: string): RegressionLearner | undefined {
  return Object.hasOwn(regressionFactories, name) ? regressionFactories[name]() : undefined;
}

/**
 * Memory the learners keep on a thread between fits (work arrays; the memories of the WebAssembly
 * kernels, each a KernelSlot of src/numerics/wasm.ts, all released together), released by
 * {@link releaseLearnerMemory}. A learner with other such memory adds its release here, so that the
 * curve loop knows no learner's internals.
 */
const releases: (() => void)[] = [releaseScratch, releaseKernelMemory];

/** Gives back the memory the learners keep on this thread between fits; they reallocate it when next fitting. */
export function releaseLearnerMemory(): void {
  for (const release of releases) release();
}
