/**
 * Says a study's measurement and forecast errors in the study file's terms: a study has no
 * command-line options, so a message about `--learner` is reworded to name the file and its key
 * `measure.learner` (`--family`: `forecast.family`).
 */
import { DataError, UsageError } from "../errors.js";
import { message } from "../messages.js";

/**
 * A UsageError whose message starts with an option (`--learner: unknown name ...`) becomes a
 * DataError naming the study file and the key in `section` (`study.json: measure.learner: unknown
 * name ...`); another UsageError is prefixed with the study file (`study.json: forecast: target 2 is
 * outside ...`); any other error is returned unchanged.
 */
export function inStudyTerms(error: unknown, studyFile: string, section: "measure" | "forecast" = "measure"): unknown {
  if (!(error instanceof UsageError)) return error;
  const match = /^--([a-z][a-z-]*)(:? )(.*)$/.exec(error.message);
  const reworded =
    match === null
      ? new DataError(`${studyFile}: ${error.message}`)
      : new DataError(
          message.badKey(
            studyFile,
            `${section}.${match[1].replace(/-([a-z])/g, (_, c: string) => c.toUpperCase())}`,
            match[2] === ": " ? match[3] : `${match[1]} ${match[3]}`,
          ),
        );
  reworded.stack = error.stack;
  return reworded;
}
