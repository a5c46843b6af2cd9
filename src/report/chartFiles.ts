/**
 * The charts as files for slides and documents: SVG drawn by vega in Node, and PNG rasterized from
 * that SVG by resvg.
 *
 * SVG: vega-lite compiles the spec, vega draws it with its headless SVG renderer (`renderer: "none"`
 * and `toSVG()`, no canvas and no browser needed). Cost and value sliders do not exist in a file: the
 * chart is drawn at the plan's values.
 *
 * PNG: resvg draws no text at all unless it is given fonts. It gets the DejaVu Sans files when they
 * are installed (Debian's fonts-dejavu-core), and nothing else, so the same SVG gives the same PNG on
 * every machine that has them; elsewhere it falls back to the system's fonts.
 */
import { existsSync } from "node:fs";
import { join } from "node:path";
import { Resvg } from "@resvg/resvg-js";
import * as vega from "vega";
import { compile, type TopLevelSpec } from "vega-lite";

/** Folders where Linux distributions put DejaVu Sans (Debian and Ubuntu first). */
const dejaVuFolders = [
  "/usr/share/fonts/truetype/dejavu",
  "/usr/share/fonts/dejavu",
  "/usr/share/fonts/TTF",
  "/usr/share/fonts/dejavu-sans-fonts",
];
const dejaVuFiles = ["DejaVuSans.ttf", "DejaVuSans-Bold.ttf", "DejaVuSans-Oblique.ttf", "DejaVuSans-BoldOblique.ttf"];

/** The fonts PNG rendering uses: DejaVu Sans files, or none found (then the system's fonts). */
export interface ChartFonts {
  files: string[];
  family: string | undefined;
}

/**
 * Finds the DejaVu Sans files (regular and bold at least) in the usual folders.
 * @param folders where to look
 */
export function findChartFonts(folders: readonly string[] = dejaVuFolders): ChartFonts {
  for (const folder of folders) {
    const files = dejaVuFiles.map((name) => join(folder, name)).filter((path) => existsSync(path));
    if (files.length >= 2) return { files, family: "DejaVu Sans" };
  }
  return { files: [], family: undefined };
}

/** A vega and vega-lite logger that keeps quiet: a library prints nothing. */
function quietLogger() {
  let level = 0;
  const logger = {
    level(value?: number) {
      if (value === undefined) return level as never;
      level = value;
      return logger;
    },
    error: () => logger,
    warn: () => logger,
    info: () => logger,
    debug: () => logger,
  };
  return logger;
}

/**
 * Draws a Vega-Lite spec as a standalone SVG document (with its XML namespace), in Node.
 *
 * @throws Error when vega cannot parse the compiled spec (a bug in a chart function, not user input)
 * @example
 * const svg = await chartSvg(learningCurveChart(curve, forecast));
 * // svg.startsWith("<svg") → true
 */
export async function chartSvg(spec: TopLevelSpec): Promise<string> {
  const compiled = compile(spec, { logger: quietLogger() as never });
  const view = new vega.View(vega.parse(compiled.spec), {
    renderer: "none",
    logger: quietLogger() as never,
    logLevel: vega.None,
  });
  try {
    return numberClipPaths(await view.toSVG());
  } finally {
    view.finalize();
  }
}

/**
 * Renumbers the SVG's clip paths clip1, clip2, ... in order of appearance. Vega numbers them from a
 * counter shared by every view in the process, so without this the same chart would give different
 * bytes depending on what was drawn before it.
 */
export function numberClipPaths(svg: string): string {
  const numbers = new Map<string, number>();
  return svg.replace(/(url\(#|id=")clip(\d+)/g, (_match, prefix: string, old: string) => {
    if (!numbers.has(old)) numbers.set(old, numbers.size + 1);
    return `${prefix}clip${numbers.get(old)}`;
  });
}

/**
 * Rasterizes an SVG to PNG at `scale` times its size (2 by default: sharp on slides and high-density
 * screens), with the text drawn in the given fonts.
 *
 * @param fonts from `findChartFonts()`; without files resvg uses the system's fonts
 */
export function chartPng(svg: string, fonts: ChartFonts = findChartFonts(), scale = 2): Buffer {
  const font =
    fonts.files.length > 0
      ? {
          loadSystemFonts: false,
          fontFiles: fonts.files,
          defaultFontFamily: fonts.family,
          sansSerifFamily: fonts.family,
        }
      : { loadSystemFonts: true };
  const resvg = new Resvg(svg, { font, fitTo: { mode: "zoom", value: scale }, background: "#ffffff" });
  return resvg.render().asPng();
}
