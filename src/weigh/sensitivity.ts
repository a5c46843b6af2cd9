/**
 * Sensitivity of the recommendation: how recommendedRuns and its expected net value move when one
 * input is 25% lower or higher, the rest held (one-way sensitivity analysis, the data of a tornado
 * chart).
 *
 * - costPerRun, valuePerPoint: scaled directly (fixedCost stays).
 * - samplesPerRun: every sample count of the yield model scaled and rounded (range ends too); the
 *   new sizes are read from the forecast by interpolation in log(trainingSize), so the forecast must
 *   reach them (`headroom study` asks for them; otherwise the entry is null with a note).
 * - asymptote: the gap between the asymptote and today's expected score, a − s(n₀), scaled. For the
 *   inverse power law s(n) = a − b·n^(−c) with the exponent c and today's score s(n₀) held, the gain
 *   over today is s(n) − s(n₀) = (a − s(n₀))·(1 − (n₀/n)^c), so scaling the gap scales every gain by
 *   the same factor. Each draw's gain over its own today's score is scaled so (and clamped to the
 *   metric's range): exact for the inverse power law with c held, an approximation for other curves
 *   and for draws whose exponent would also move.
 */
import type { SensitivityEntry, SensitivityOutcome } from "./decisionFile.js";
import { weighTable, type CurveChange, type TableContext } from "./decisionTable.js";
import type { ResolvedPlan } from "./plan.js";
import { scaledYield, sizesToProject, yieldBounds } from "./yields.js";

/** The relative change of each input. */
export const sensitivityChange = 0.25;

/**
 * @param asymptote the forecast's asymptote (`asymptote`, weighted over families; older files: parameter `a`)
 */
export function sensitivityOfRecommendation(
  resolved: ResolvedPlan,
  context: TableContext,
  asymptote: number | undefined,
): SensitivityEntry[] {
  const todayExpected = context.grid.expectedAt(context.today);
  const outcome = (
    change: number,
    plan: ResolvedPlan,
    value: number | null,
    curve?: CurveChange,
  ): SensitivityOutcome => {
    const result = weighTable(plan, context, curve);
    const row = result.rows[result.recommendedRuns];
    return { change, value, recommendedRuns: result.recommendedRuns, netValue: row.expectedNetValue };
  };
  const entries: SensitivityEntry[] = [];
  const both = (make: (change: number) => SensitivityOutcome | null) => ({
    low: make(-sensitivityChange),
    high: make(sensitivityChange),
  });

  entries.push({
    factor: "costPerRun",
    ...both((change) => {
      const costPerRun = resolved.plan.costPerRun * (1 + change);
      return outcome(change, { ...resolved, plan: { ...resolved.plan, costPerRun } }, costPerRun);
    }),
  });

  let yieldNote: string | undefined;
  entries.push({
    factor: "samplesPerRun",
    ...both((change) => {
      const yieldModel = scaledYield(resolved.yieldModel, 1 + change);
      const needed = sizesToProject(yieldModel, context.today, resolved.plan.maxRuns);
      const beyond = needed.filter((size) => !context.grid.covers(size));
      if (beyond.length > 0) {
        yieldNote = `The forecast does not reach training size ${Math.max(...beyond)}; forecast to larger sizes to see a ${change > 0 ? "higher" : "lower"} yield.`;
        return null;
      }
      const expectedYield = yieldBounds(yieldModel).expected;
      const scaled: ResolvedPlan = {
        ...resolved,
        yieldModel,
        expectedYield,
        collectedPerRun: resolved.collectedPerRun * (1 + change),
      };
      return outcome(change, scaled, expectedYield);
    }),
  });
  if (yieldNote !== undefined) entries[entries.length - 1].note = yieldNote;

  entries.push({
    factor: "valuePerPoint",
    ...both((change) => {
      const valuePerPoint = resolved.valuePerPoint * (1 + change);
      return outcome(change, { ...resolved, valuePerPoint }, valuePerPoint);
    }),
  });

  entries.push({
    factor: "asymptote",
    ...both((change) =>
      outcome(
        change,
        resolved,
        asymptote === undefined ? null : todayExpected + (1 + change) * (asymptote - todayExpected),
        { gainScale: 1 + change },
      ),
    ),
    note:
      "The gap between the asymptote and today's expected score is scaled, the curve's exponent and " +
      "today's score held: every projected gain over today scales by the same factor.",
  });
  return entries;
}
