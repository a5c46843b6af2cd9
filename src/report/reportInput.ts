/**
 * What the report is made from: the three files of a study and a few words about its context.
 */
import type { CurveFile } from "../curve/curveFile.js";
import type { ForecastFile } from "../forecast/forecastFile.js";
import type { DecisionFile } from "../weigh/decisionFile.js";

/** Everything the report shows. */
export interface ReportInput {
  curve: CurveFile;
  forecast: ForecastFile;
  /** The weighed runs; without it the report shows the projection only. */
  decision?: DecisionFile;
  /** Page title (default: "<Metric> learning curve"). */
  title?: string;
  /**
   * Field of use ("clinical", "public-health", "safety", ...), before the decision's own `domain`. A
   * field about people (health, care, safety, the public) adds the caution about people when the
   * decision does not already carry it.
   */
  domain?: string;
  /** Currency of costs and values ("EUR"). */
  currency?: string;
  reproducibility: {
    toolVersion: string;
    /** Seed of the run (default: the forecast's seed). */
    seed?: number;
    /** SHA-256 of the input data (default: the curve's source checksum). */
    inputSha256?: string;
    /** The command line that made the report. */
    command?: string;
    /** Not allowed: the report must be byte-deterministic, so it carries no time of creation. */
    generatedAt?: never;
  };
}
