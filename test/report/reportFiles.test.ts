/**
 * Tests of the report's files for slides and spreadsheets: the list `reportFiles` returns, each chart
 * drawn to SVG by vega in Node, and each SVG rasterized to PNG by resvg with readable text.
 *
 * The PNG files are read back with a PNG reader written here from the specification (./png.ts), so
 * the check does not trust the library that wrote them. "Readable text" is checked by drawing: the
 * title band of a chart has dark pixels only when resvg was given the DejaVu fonts (without fonts
 * resvg draws no text at all), and none once the SVG's text elements are removed.
 */
import { existsSync } from "node:fs";
import { describe, expect, it } from "vitest";
import { chartPng, chartSvg, findChartFonts, numberClipPaths } from "../../src/report/chartFiles.js";
import { learningCurveChart, reportCharts } from "../../src/report/charts.js";
import { decisionTableCsv, renderReportHtml } from "../../src/report/html.js";
import { reportFiles } from "../../src/report/reportFiles.js";
import { darkPixels, decodePng } from "./png.js";
import { sampleCurve, sampleDecision, sampleForecast, sampleInput } from "./sampleInputs.js";

/** The width and height attributes of an SVG document's root element. */
function svgSize(svg: string): { width: number; height: number } {
  const match = /^<svg[^>]*\bwidth="(\d+)"[^>]*\bheight="(\d+)"/.exec(svg);
  if (!match) throw new Error("no width and height on the svg element");
  return { width: Number(match[1]), height: Number(match[2]) };
}

describe("findChartFonts", () => {
  it("finds DejaVu Sans, regular and bold, where Debian's fonts-dejavu-core puts it", () => {
    const fonts = findChartFonts();
    expect(fonts.family).toBe("DejaVu Sans");
    expect(fonts.files).toContain("/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf");
    expect(fonts.files).toContain("/usr/share/fonts/truetype/dejavu/DejaVuSans-Bold.ttf");
    expect(fonts.files.every((file) => existsSync(file))).toBe(true);
  });

  it("reports no fonts where there are none", () => {
    expect(findChartFonts(["/nonexistent-folder"])).toEqual({ files: [], family: undefined });
  });
});

describe("chartSvg and chartPng", () => {
  const spec = learningCurveChart(sampleCurve, sampleForecast, sampleDecision, { currency: "EUR" });

  it("draws a standalone SVG with the chart's text", async () => {
    const svg = await chartSvg(spec);
    expect(svg).toMatch(/^<svg xmlns="http:\/\/www\.w3\.org\/2000\/svg"/);
    expect(svg).toContain(">Learning curve: accuracy against training samples</text>");
    expect(svg).toContain(">Training samples</text>");
    expect(svg).toContain(">Target 85%</text>");
  });

  it("rasterizes it at twice its size, with the title drawn in the fonts given", async () => {
    const svg = await chartSvg(spec);
    const { width, height } = svgSize(svg);
    const fonts = findChartFonts();
    const png = decodePng(chartPng(svg, fonts));
    expect([png.width, png.height]).toEqual([2 * width, 2 * height]);
    // The title's band: the top 30 SVG pixels (60 PNG pixels) above the plot, where only text is drawn.
    const band = (image: typeof png) => darkPixels(image, 0, 0, image.width, 60);
    const withFonts = band(png);
    const noFonts = band(decodePng(chartPng(svg, { files: ["/nonexistent.ttf"], family: "DejaVu Sans" })));
    const noText = band(decodePng(chartPng(svg.replace(/<text\b[^>]*>[^<]*<\/text>/g, ""), fonts)));
    expect(withFonts).toBeGreaterThan(1000);
    expect(noText).toBe(0);
    expect(noFonts).toBe(0);
  });

  it("numbers clip paths by order of appearance, whatever vega's counter says", () => {
    expect(
      numberClipPaths(
        '<clipPath id="clip7"/><g clip-path="url(#clip7)"/><clipPath id="clip3"/><g clip-path="url(#clip3)"/>',
      ),
    ).toBe('<clipPath id="clip1"/><g clip-path="url(#clip1)"/><clipPath id="clip2"/><g clip-path="url(#clip2)"/>');
  });

  it("gives the same bytes every time", async () => {
    const svg = await chartSvg(spec);
    expect(await chartSvg(spec)).toBe(svg);
    expect(Buffer.compare(chartPng(svg), chartPng(svg))).toBe(0);
  });
});

describe("reportFiles", () => {
  it("lists the page, the table and each chart as SVG and PNG", async () => {
    const files = await reportFiles(sampleInput);
    const charts = reportCharts(sampleInput).map((chart) => chart.id);
    expect(files.map((f) => f.fileName)).toEqual([
      "report.html",
      "decision.csv",
      ...charts.flatMap((id) => [`${id}.svg`, `${id}.png`]),
    ]);
    expect(charts).toEqual(["chart-learning-curve", "chart-score", "chart-net-value", "chart-sensitivity"]);
    expect(files[0].content).toBe(renderReportHtml(sampleInput));
    expect(files[1].content).toBe(decisionTableCsv(sampleDecision));
    for (const file of files.filter((f) => f.fileName.endsWith(".svg"))) {
      const png = files.find((f) => f.fileName === file.fileName.replace(/\.svg$/, ".png"))!;
      const { width, height } = svgSize(file.content as string);
      const decoded = decodePng(png.content as Buffer);
      expect([decoded.width, decoded.height], file.fileName).toEqual([2 * width, 2 * height]);
    }
  });

  it("draws the net-value chart at the plan's values, stating the recommendation", async () => {
    const files = await reportFiles(sampleInput);
    const svg = files.find((f) => f.fileName === "chart-net-value.svg")!.content as string;
    expect(svg).toContain(">Recommended: 2 further runs, expected net value 20,400 EUR</text>");
  });

  it("leaves out the table without a decision, and the charts when asked", async () => {
    const withoutDecision = await reportFiles({ ...sampleInput, decision: undefined });
    expect(withoutDecision.map((f) => f.fileName)).toEqual([
      "report.html",
      "chart-learning-curve.svg",
      "chart-learning-curve.png",
    ]);
    const pageOnly = await reportFiles(sampleInput, { chartFiles: false });
    expect(pageOnly.map((f) => f.fileName)).toEqual(["report.html", "decision.csv"]);
  });

  it("gives the same bytes for the same input", async () => {
    const first = await reportFiles(sampleInput);
    const second = await reportFiles(structuredClone(sampleInput));
    expect(second.map((f) => f.fileName)).toEqual(first.map((f) => f.fileName));
    for (let i = 0; i < first.length; i++) {
      expect(Buffer.compare(Buffer.from(second[i].content), Buffer.from(first[i].content)), first[i].fileName).toBe(0);
    }
  });
});
