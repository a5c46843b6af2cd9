import { describe, expect, it } from "vitest";
import { commandLineNames } from "../../src/cli/program.js";
import { resolveMeasureOptions } from "../../src/curve/measure.js";
import { DataError, FitError, UsageError } from "../../src/errors.js";
import { message } from "../../src/messages.js";
import { inStudyTerms, studyKeys } from "../../src/study/studyErrors.js";

function thrown(action: () => unknown): unknown {
  try {
    action();
  } catch (error) {
    return error;
  }
  throw new Error("nothing was thrown");
}

describe("errors about an option, named by each front end", () => {
  const error = thrown(() => resolveMeasureOptions({ repeats: 0 })) as UsageError;

  it("carry the option as their subject, and the library names it as in its options object", () => {
    expect(error).toBeInstanceOf(UsageError);
    expect(error.subject).toEqual({ option: "repeats" });
    expect(error.message).toBe("repeats: '0' is not a whole number of at least 1");
  });

  it("say --repeats on the command line and measure.repeats in a study file", () => {
    expect(error.describe(commandLineNames)).toBe("--repeats: '0' is not a whole number of at least 1");
    const study = inStudyTerms(error, "s.json") as DataError;
    expect(study).toBeInstanceOf(DataError);
    expect(study.message).toBe("s.json: measure.repeats: '0' is not a whole number of at least 1");
  });

  it("name options that differ from the library's: trainingSizes is --sizes and measure.sizes", () => {
    expect(commandLineNames("trainingSizes")).toBe("--sizes");
    expect(commandLineNames("byRuns")).toBe("--by-runs");
    expect(studyKeys("measure")("trainingSizes")).toBe("measure.sizes");
    expect(studyKeys("measure")("label")).toBe("label");
    expect(studyKeys("forecast")("seed")).toBe("measure.seed");
    expect(studyKeys("forecast")("family")).toBe("forecast.family");
  });

  it("name the options mentioned inside a message too, and keep the class of a data error", () => {
    const byRuns = thrown(() => resolveMeasureOptions({ learner: "ridge", task: "classification" })) as UsageError;
    expect(byRuns.describe(commandLineNames)).toBe(
      "--learner: 'ridge' is for regression, but the task is classification (set --task, or choose another learner)",
    );
    const data = new DataError((n) => message.classTooSmall("d.csv", "b", 2, 5, n));
    const reworded = inStudyTerms(data, "s.json") as DataError;
    expect(reworded).toBeInstanceOf(DataError);
    expect(reworded.message).toBe(
      "d.csv: class 'b' has 2 rows, fewer than measure.folds 5; lower measure.folds or collect more of that class",
    );
    const fit = inStudyTerms(new FitError("no points"), "s.json");
    expect(fit).toBeInstanceOf(FitError);
    expect((fit as FitError).message).toBe("no points");
  });

  it("name the cluster options in the study's keys: measure.tasksDir, measure.on", () => {
    const error = new UsageError(message.slurmOnlyOption("tasksDir"));
    expect(error.describe(commandLineNames)).toBe("--tasks-dir is only used with --on slurm");
    expect((inStudyTerms(error, "s.json") as DataError).message).toBe(
      "s.json: measure.tasksDir is only used with measure.on slurm",
    );
  });
});
