import { describe, it, expect } from "vitest";
import {
  createLearner,
  createRegressionLearner,
  learnerNames,
  regressionLearnerNames,
  releaseLearnerMemory,
} from "../../src/learners/registry.js";
import { scratchDoubles } from "../../src/learners/scratch.js";
import { UsageError } from "../../src/errors.js";
import { RandomStream } from "../../src/random.js";
import { loadOpenData } from "../helpers/openData.js";
import { loadDiabetes } from "./sklearnReference.js";

describe("learner registry", () => {
  it("lists the classification and regression learners under separate names", () => {
    expect(learnerNames()).toEqual(["logistic", "lda", "naive-bayes", "knn", "forest", "svm"]);
    expect(regressionLearnerNames()).toEqual(["ridge", "knn-regression"]);
    for (const name of learnerNames()) {
      expect(createLearner(name)!.name).toBe(name);
      expect(createRegressionLearner(name)).toBeUndefined();
    }
    for (const name of regressionLearnerNames()) {
      const learner = createRegressionLearner(name)!;
      expect(learner.name).toBe(name);
      expect(learner.task).toBe("regression");
      expect(createLearner(name)).toBeUndefined();
    }
    expect(createLearner("toString")).toBeUndefined();
  });

  it.each(learnerNames())("%s: every tuning setting builds a learner that fits", (name) => {
    const d = loadOpenData("iris");
    const learner = createLearner(name)!;
    const grid = learner.tuningGrid ?? [];
    if (name !== "lda") expect(grid.length).toBeGreaterThanOrEqual(3);
    for (const settings of grid) {
      const tuned = learner.withOptions!(settings);
      expect(tuned.name).toBe(name);
      const model = tuned.fit(
        { features: d.features, rows: d.rows, columns: d.columns, labels: d.labels, classCount: 3 },
        new RandomStream(1),
      );
      const p = model.predictProbabilities(d.features.slice(0, 2 * d.columns), 2);
      expect(p.length).toBe(6);
    }
    expect(() => learner.withOptions!({ noSuchSetting: 1 })).toThrow(UsageError);
  });

  it.each(regressionLearnerNames())("%s: every tuning setting builds a learner that fits", (name) => {
    const d = loadDiabetes();
    const learner = createRegressionLearner(name)!;
    expect(learner.tuningGrid!.length).toBeGreaterThanOrEqual(3);
    for (const settings of learner.tuningGrid!) {
      const model = learner.withOptions!(settings).fit(
        { features: d.features, rows: d.rows, columns: d.columns, targets: d.targets },
        new RandomStream(1),
      );
      expect(model.predictValues(d.features.slice(0, d.columns), 1).length).toBe(1);
    }
    expect(() => learner.withOptions!({ noSuchSetting: 1 })).toThrow(UsageError);
  });

  it("the logistic tuning grid is C in {0.01, 0.1, 1, 10, 100} and withOptions keeps the other options", () => {
    const logistic = createLearner("logistic")!;
    expect(logistic.tuningGrid).toEqual([{ C: 0.01 }, { C: 0.1 }, { C: 1 }, { C: 10 }, { C: 100 }]);
    const options = (learner: unknown) => (learner as { options: Record<string, number> }).options;
    const tuned = logistic.withOptions!({ C: 10 });
    expect(options(tuned)).toEqual({ ...options(logistic), C: 10 });
  });
});

describe("releaseLearnerMemory", () => {
  it("drops the learners' work arrays on this thread, so that the next fit allocates anew", () => {
    const before = scratchDoubles("test.release", 8);
    expect(scratchDoubles("test.release", 8).buffer).toBe(before.buffer);
    releaseLearnerMemory();
    expect(scratchDoubles("test.release", 8).buffer).not.toBe(before.buffer);
  });
});
