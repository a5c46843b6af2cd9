/**
 * Checks shared by every learner's options: the names given to `withOptions` (from a tuning grid or
 * the command line) and the common kinds of value. Each learner's resolver calls these, so its
 * messages name the learner and the setting.
 */
import { UsageError } from "../errors.js";
import { message } from "../messages.js";
import type { LearnerSettings } from "./learner.js";

/**
 * Throws when a setting is not one the learner has.
 * @throws UsageError naming the learner, the unknown setting and the known ones.
 */
export function checkSettingNames(learner: string, settings: LearnerSettings, known: readonly string[]): void {
  for (const name of Object.keys(settings)) {
    if (!known.includes(name)) throw new UsageError(message.unknownSetting(learner, name, known));
  }
}

/**
 * The value, checked to be a positive finite number.
 * @throws UsageError naming the learner and the setting.
 */
export function positive(learner: string, name: string, value: number): number {
  if (!(Number.isFinite(value) && value > 0)) throw new UsageError(message.settingNotPositive(learner, name, value));
  return value;
}

/**
 * The value, checked to be a non-negative finite number.
 * @throws UsageError naming the learner and the setting.
 */
export function nonNegative(learner: string, name: string, value: number): number {
  if (!(Number.isFinite(value) && value >= 0)) throw new UsageError(message.settingNegative(learner, name, value));
  return value;
}

/**
 * The value, checked to be a whole number of at least `min`.
 * @throws UsageError naming the learner and the setting.
 */
export function wholeNumber(learner: string, name: string, value: number, min: number): number {
  if (!(Number.isInteger(value) && value >= min))
    throw new UsageError(message.settingNotWhole(learner, name, value, min));
  return value;
}
