/**
 * Says a study's measurement errors in the study file's terms: a study has no command-line options,
 * so a message about `--learner` is reworded to name the file and its key `measure.learner`.
 */
import { DataError, UsageError } from "../errors.js";
import { message } from "../messages.js";

/**
 * A UsageError whose message starts with an option (`--learner: unknown name ...`) becomes a
 * DataError naming the study file and the key (`study.json: measure.learner: unknown name ...`);
 * any other error is returned unchanged.
 */
export function inStudyTerms(error: unknown, studyFile: string): unknown {
  if (!(error instanceof UsageError)) return error;
  const match = /^--([a-z][a-z-]*)(:? )(.*)$/.exec(error.message);
  if (match === null) return error;
  const key = `measure.${match[1].replace(/-([a-z])/g, (_, c: string) => c.toUpperCase())}`;
  const detail = match[2] === ": " ? match[3] : `${match[1]} ${match[3]}`;
  const reworded = new DataError(message.badKey(studyFile, key, detail));
  reworded.stack = error.stack;
  return reworded;
}
