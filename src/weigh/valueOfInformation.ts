/**
 * Expected value of sample information (EVSI) for a go/no-go decision, by Monte Carlo
 * preposterior analysis over prior draws (Raiffa and Schlaifer 1961, "Applied Statistical Decision
 * Theory", ch. 4–5; Ades, Lu and Claxton 2004, Med Decis Making 24:207, for the Monte Carlo form).
 *
 * The decision has two options: go, whose payoff relative to no-go is an uncertain U, and no-go
 * (payoff 0). Deciding now, one goes when E[U] > 0 and expects max(E[U], 0). A sample would first
 * show X = M + ε, ε ~ Normal(0, τ²), where M is a quantity the sample measures; deciding after it
 * one expects E_X[max(E[U | X], 0)]. EVSI is the difference, never negative in expectation.
 *
 * The prior is a set of equally likely draws (u_j, m_j), such as the forecast's draws: draw j is
 * one plausible world. The estimator loops over simulations s = 1..S; simulation s takes world
 * t = s mod J as the truth (a stratified choice), draws x = m_t + τ·z, and computes P_s = E[U | x] by
 * weighting the other draws i ≠ t by their likelihood exp(−(x − m_i)² / 2τ²) (leaving the true world
 * out keeps a finite set of draws from rewarding itself with perfect information).
 *
 * Since the preposterior mean of P is the prior mean E[U] (the law of total expectation),
 * EVSI = E[max(P, 0)] − max(E[P], 0) equals E[max(−P, 0)] when going is the choice now and
 * E[max(P, 0)] when it is not: the expected amount by which the sample would reverse today's choice.
 * The estimator averages that over simulations; it is never negative and has a far smaller variance
 * than the difference of the two means, because only simulations that reverse the choice add to it.
 * The standard error is that of the mean over simulations.
 */
import jStat from "jstat";
import type { RandomStream } from "../random.js";

export interface SampleInformationValue {
  /** Expected value of sample information: the mean amount by which the sample reverses today's choice. */
  evsi: number;
  /** Monte Carlo standard error of evsi. */
  standardError: number;
  /** max(E[U], 0): the expected payoff of deciding now. */
  valueNow: number;
  /** E_X[max(E[U | X], 0)] = valueNow + evsi: the expected payoff of deciding after the sample. */
  valueWithInformation: number;
  /** Whether going is the better choice now (E[U] > 0). */
  goNow: boolean;
  /** Share of simulated samples after which the decision would differ from today's. */
  probabilityDecisionChanges: number;
  simulations: number;
}

/**
 * EVSI of observing `observed` with noise `observationSd` for the go/no-go decision on `payoff`.
 * @param payoff u_j: payoff of going rather than not, in draw j
 * @param observed m_j: what the sample measures, in draw j (without its noise)
 * @param observationSd τ > 0, the sample's noise
 * @param simulations preposterior simulations S
 * @throws RangeError for fewer than 2 draws, unequal lengths or τ ≤ 0
 */
export function sampleInformationValue(
  payoff: ArrayLike<number>,
  observed: ArrayLike<number>,
  observationSd: number,
  stream: RandomStream,
  simulations: number,
): SampleInformationValue {
  const draws = payoff.length;
  if (draws < 2 || observed.length !== draws) throw new RangeError("need at least 2 paired draws");
  if (!(observationSd > 0)) throw new RangeError("the observation's standard deviation must be positive");
  let sum = 0;
  for (let i = 0; i < draws; i++) sum += payoff[i];
  const meanNow = sum / draws;
  const goNow = meanNow > 0;
  const valueNow = Math.max(meanNow, 0);
  const scale = 1 / (2 * observationSd * observationSd);
  const logWeights = new Float64Array(draws);
  let total = 0;
  let totalSquares = 0;
  let changes = 0;
  for (let s = 0; s < simulations; s++) {
    const truth = s % draws;
    const x = observed[truth] + observationSd * stream.normal();
    let largest = -Infinity;
    for (let i = 0; i < draws; i++) {
      const d = x - observed[i];
      logWeights[i] = -d * d * scale;
      if (i !== truth && logWeights[i] > largest) largest = logWeights[i];
    }
    let weightSum = 0;
    let weighted = 0;
    for (let i = 0; i < draws; i++) {
      if (i === truth) continue;
      const w = Math.exp(logWeights[i] - largest);
      weightSum += w;
      weighted += w * payoff[i];
    }
    const posteriorMean = weighted / weightSum;
    // What the sample gains by reversing today's choice (0 when it confirms it).
    const reversal = Math.max(goNow ? -posteriorMean : posteriorMean, 0);
    total += reversal;
    totalSquares += reversal * reversal;
    if (reversal > 0) changes++;
  }
  const evsi = total / simulations;
  const variance = Math.max(0, totalSquares / simulations - evsi * evsi);
  return {
    evsi,
    standardError: Math.sqrt(variance / simulations),
    valueNow,
    valueWithInformation: valueNow + evsi,
    goNow,
    probabilityDecisionChanges: changes / simulations,
    simulations,
  };
}

/**
 * The closed form of EVSI for a normal prior and two options with a payoff linear in the unknown
 * (Raiffa and Schlaifer 1961): with prior θ ~ Normal(μ₀, σ₀²), payoff θ for go and 0 for no-go, and
 * the mean of n observations of sd σ, the preposterior mean E[θ | X] is normal with mean μ₀ and sd
 * s = σ₀² / √(σ₀² + σ²/n), so EVSI = E[max(E[θ|X], 0)] − max(μ₀, 0) = s·φ(μ₀/s) − |μ₀|·Φ(−|μ₀|/s).
 * @example
 * normalSampleInformationValue(0, 1, 2, 4) // → 0.28209... (= 1/√2 · φ(0))
 */
export function normalSampleInformationValue(
  priorMean: number,
  priorSd: number,
  observationSd: number,
  observations: number,
): number {
  const s = (priorSd * priorSd) / Math.sqrt(priorSd * priorSd + (observationSd * observationSd) / observations);
  const m = Math.abs(priorMean);
  return s * jStat.normal.pdf(m / s, 0, 1) - m * jStat.normal.cdf(-m / s, 0, 1);
}
