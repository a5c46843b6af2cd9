/**
 * Says a study's measurement and forecast errors in the study file's terms: a study has no
 * command-line options, so an error about the option `learner` names the file and its key
 * `measure.learner` (`family`: `forecast.family`).
 */
import { DataError, HeadroomError, UsageError, type OptionNamer } from "../errors.js";
import { message } from "../messages.js";

/** The study file's key for each library option whose key is not `<section>.<option>`. */
const keyOfOption: Record<"measure" | "forecast", Readonly<Record<string, string>>> = {
  measure: { label: "label", group: "group", ignore: "ignore", trainingSizes: "measure.sizes" },
  // The forecast takes the study's seed and its sizes from the plan.
  forecast: { seed: "measure.seed", at: "plan" },
};

/** How a study file names the options of its `section`'s library call. */
export function studyKeys(section: "measure" | "forecast"): OptionNamer {
  return (option) => keyOfOption[section][option] ?? `${section}.${option}`;
}

/**
 * A UsageError becomes a DataError prefixed with the study file, its options named by their keys
 * (`learner: unknown name ...` becomes `study.json: measure.learner: unknown name ...`); another
 * headroom error keeps its class and names options by their keys; any other error is returned
 * unchanged.
 */
export function inStudyTerms(error: unknown, studyFile: string, section: "measure" | "forecast" = "measure"): unknown {
  if (!(error instanceof HeadroomError)) return error;
  const text = error.describe(studyKeys(section));
  let reworded: HeadroomError;
  if (error instanceof UsageError) reworded = new DataError(message.inFile(studyFile, text));
  else {
    const Same = error.constructor as new (text: string) => HeadroomError;
    reworded = new Same(text);
  }
  reworded.stack = error.stack;
  return reworded;
}
