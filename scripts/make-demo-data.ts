/**
 * Writes the invented demo study's data, `fixtures/demo/water-samples.csv`: water samples from four
 * sampling cruises of an imaginary coastal monitoring lab, each labeled `bloom-risk` or `clear`.
 * Run with `npx tsx scripts/make-demo-data.ts`; the same seed always writes the same file.
 *
 * Generative model (a latent logistic model; nothing was fitted to real data):
 * 1. Each sample gets 18 latent standard-normal scores z_j. The four nutrient scores share a common
 *    factor (correlation about 0.36 between any two), the rest are independent.
 * 2. The label follows a logistic model on the latent scores:
 *    P(bloom-risk) = 1 / (1 + exp(-(intercept + sum_j weight_j * z_j))). The signal is spread thinly:
 *    two readings (chlorophyll-a, water temperature) have moderate weights, most have small ones,
 *    four have none. The weights are scaled so that the log-odds have standard deviation 12 and the
 *    intercept gives about 31% bloom-risk samples.
 * 3. About 3% of labels are flipped at random (mislabeled or ambiguous samples), which caps the
 *    accuracy any learner can reach.
 * 4. Each cruise adds its own offset (standard deviation 0.4 in latent units) to six sensors that are
 *    recalibrated between cruises (turbidity, oxygen, pH, phycocyanin, conductivity, CDOM). The
 *    offsets are unrelated to the label, so they only blur it.
 * 5. Latent scores become readings in plausible units: `center + spread * z` for normal readings,
 *    `center * exp(spread * z)` for positive, skewed ones (concentrations, turbidity).
 * 6. About 1.5% of the feature cells are blanked out (missing values), completely at random.
 */
import { mkdirSync, writeFileSync } from "node:fs";
import { dirname, join } from "node:path";
import { fileURLToPath } from "node:url";
import { RandomStream } from "../src/random.js";

/** The seed of the demo data; change it and the README together. */
const SEED = 20261130;
/** Samples per pilot cruise (C1..C4), 120 in all: the pilot cruises sampled about 30 stations each. */
const SAMPLES_PER_CRUISE = [31, 29, 30, 30];
/** Standard deviation of the latent log-odds: how sharply the readings as a whole separate the classes. */
const LOG_ODDS_SPREAD = 12;
/** Log-odds of bloom-risk when every latent score is 0; with the spread above, about 31% bloom-risk. */
const INTERCEPT = -6;
const LABEL_FLIP_FRACTION = 0.03;
const MISSING_FRACTION = 0.015;
const CRUISE_OFFSET_SPREAD = 0.4;
const NUTRIENT_FACTOR_LOADING = 0.6;

/**
 * One reading: [column, scale, center, spread, decimals, weight, trait]. Scale "normal" prints
 * center + spread * z, "lognormal" prints center * exp(spread * z); weight is the latent score's
 * relative weight in the label's log-odds; trait "batch" marks a sensor that shifts from cruise to
 * cruise, "nutrient" one that loads on the shared nutrient factor.
 */
type Reading = [
  name: string,
  scale: "normal" | "lognormal",
  center: number,
  spread: number,
  decimals: number,
  weight: number,
  trait?: "batch" | "nutrient",
];

const READINGS: Reading[] = [
  ["water_temp_c", "normal", 17.5, 2.4, 1, 0.8],
  ["salinity_psu", "normal", 33.2, 1.1, 2, -0.4],
  ["chlorophyll_a_ugl", "lognormal", 3.2, 0.55, 2, 1.0],
  ["nitrate_umol", "lognormal", 4.5, 0.6, 2, 0.5, "nutrient"],
  ["phosphate_umol", "lognormal", 0.45, 0.5, 3, 0.55, "nutrient"],
  ["silicate_umol", "lognormal", 6.0, 0.5, 2, 0.2, "nutrient"],
  ["ammonium_umol", "lognormal", 0.9, 0.6, 2, 0.3, "nutrient"],
  ["turbidity_ntu", "lognormal", 2.8, 0.6, 2, 0.25, "batch"],
  ["dissolved_oxygen_mgl", "normal", 7.8, 0.7, 2, 0.45, "batch"],
  ["ph", "normal", 8.05, 0.12, 2, 0.35, "batch"],
  ["secchi_depth_m", "lognormal", 3.5, 0.35, 2, -0.5],
  ["phycocyanin_rfu", "lognormal", 1.4, 0.5, 2, 0.6, "batch"],
  ["wind_speed_ms", "lognormal", 4.5, 0.45, 1, -0.3],
  ["par_umol_m2s", "lognormal", 900, 0.35, 0, 0.2],
  ["tide_height_m", "normal", 1.6, 0.7, 2, 0],
  ["conductivity_mscm", "normal", 50.5, 1.4, 2, 0, "batch"],
  ["cdom_qsu", "lognormal", 12, 0.4, 1, 0, "batch"],
  ["sample_depth_m", "normal", 2.0, 0.8, 1, 0],
];

/** Draws every sample and returns the CSV text (header line first, `\n` line ends). */
function makeWaterSamples(seed: number): string {
  const weights = READINGS.map(([, , , , , weight]) => weight);
  const isNutrient = READINGS.map(([, , , , , , trait]) => trait === "nutrient");
  const isBatch = READINGS.map(([, , , , , , trait]) => trait === "batch");
  // Variance of sum_j weight_j * z_j: the squared weights plus the nutrients' shared-factor covariances.
  const nutrientWeights = weights.filter((_, j) => isNutrient[j]);
  const nutrientSum = nutrientWeights.reduce((a, w) => a + w, 0);
  const nutrientSquares = nutrientWeights.reduce((a, w) => a + w * w, 0);
  const variance =
    weights.reduce((a, w) => a + w * w, 0) + NUTRIENT_FACTOR_LOADING ** 2 * (nutrientSum ** 2 - nutrientSquares);
  const weightScale = LOG_ODDS_SPREAD / Math.sqrt(variance);
  const loading = NUTRIENT_FACTOR_LOADING;

  const lines = [["sample_id", "cruise", ...READINGS.map(([name]) => name), "bloom_risk"].join(",")];
  let sampleNumber = 0;
  SAMPLES_PER_CRUISE.forEach((samplesInCruise, cruiseIndex) => {
    const cruiseRandom = new RandomStream(seed, 0, cruiseIndex);
    const offsets = isBatch.map((batch) => (batch ? CRUISE_OFFSET_SPREAD * cruiseRandom.normal() : 0));
    for (let i = 0; i < samplesInCruise; i++) {
      sampleNumber++;
      const random = new RandomStream(seed, 1, sampleNumber);
      const nutrientFactor = random.normal();
      const latent = isNutrient.map((nutrient) =>
        nutrient ? loading * nutrientFactor + Math.sqrt(1 - loading * loading) * random.normal() : random.normal(),
      );
      const logOdds = weights.reduce((sum, w, j) => sum + weightScale * w * latent[j], INTERCEPT);
      let bloomRisk = random.uniform() < 1 / (1 + Math.exp(-logOdds));
      if (random.uniform() < LABEL_FLIP_FRACTION) bloomRisk = !bloomRisk;
      const cells = READINGS.map(([, scale, center, spread, decimals], j) => {
        if (random.uniform() < MISSING_FRACTION) return "";
        const z = latent[j] + offsets[j];
        const value = scale === "normal" ? center + spread * z : center * Math.exp(spread * z);
        return value.toFixed(decimals);
      });
      const sampleId = `S${String(sampleNumber).padStart(3, "0")}`;
      lines.push([sampleId, `C${cruiseIndex + 1}`, ...cells, bloomRisk ? "bloom-risk" : "clear"].join(","));
    }
  });
  return lines.join("\n") + "\n";
}

const outputDirectory = join(dirname(fileURLToPath(import.meta.url)), "..", "fixtures", "demo");
mkdirSync(outputDirectory, { recursive: true });
const outputPath = join(outputDirectory, "water-samples.csv");
const csv = makeWaterSamples(SEED);
writeFileSync(outputPath, csv);
const rows = csv.trim().split("\n").slice(1);
const bloomCount = rows.filter((row) => row.endsWith(",bloom-risk")).length;
console.log(`wrote ${outputPath}: ${rows.length} samples, ${bloomCount} bloom-risk`);
