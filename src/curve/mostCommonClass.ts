/**
 * The baseline an accuracy must beat, from curve.json's class counts: read by the forecast's
 * warnings and the report's methods appendix.
 */
import type { CurveFile } from "./curveFile.js";

/**
 * The most common class of the data set measured and its share of the rows: the accuracy a model
 * scores by always answering it, ignoring the features (scikit-learn's
 * `DummyClassifier(strategy="most_frequent")`). Null when the curve records no class counts. A tie
 * goes to the class named first.
 */
export function mostCommonClass(
  curve: Pick<CurveFile, "classNames" | "classCounts">,
): { name: string; share: number } | null {
  const counts = curve.classCounts;
  const names = curve.classNames;
  if (counts === undefined || names === undefined || counts.length !== names.length || counts.length === 0) return null;
  const total = counts.reduce((sum, count) => sum + count, 0);
  if (total <= 0) return null;
  let best = 0;
  for (let k = 1; k < counts.length; k++) if (counts[k] > counts[best]) best = k;
  return { name: names[best], share: counts[best] / total };
}
