/**
 * Learners by name, so that the command line and worker threads can create them from plain data.
 */
import type { Learner } from "./learner.js";
import { LogisticRegression } from "./logistic.js";

const factories: Record<string, () => Learner> = {
  logistic: () => new LogisticRegression(),
};

/** Names of the learners available. */
export function learnerNames(): string[] {
  return Object.keys(factories);
}

/**
 * Adds a learner under a new name, for this thread only (worker threads build their own registry
 * from this module, so a learner registered at run time is available with one worker only).
 * Tests use it for a fake learner whose score is a known function of the training size.
 */
export function registerLearner(name: string, factory: () => Learner): void {
  factories[name] = factory;
}

/** A fresh learner of that name, or undefined when the name is unknown. */
export function createLearner(name: string): Learner | undefined {
  return Object.hasOwn(factories, name) ? factories[name]() : undefined;
}
