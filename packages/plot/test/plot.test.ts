import { describe, expect, it } from "vitest";
import { decode } from "fast-png";
import { niceTicks, formatTick, viridis, mapToPng, svgToPng, xyChart, histogramChart, histogramCounts, mapChart, renderHtmlReport, logScale } from "../src/index.js";

describe("niceTicks", () => {
  it("places ticks at 1, 2, 5 × 10^k steps inside the range", () => {
    expect(niceTicks(0, 1, 5)).toAllClose([0, 0.2, 0.4, 0.6, 0.8, 1], { rtol: 1e-12, atol: 1e-15 });
    expect(niceTicks(-3.2, 7.9, 5)).toEqual([-2, 0, 2, 4, 6]);
  });
  it("log scale ticks at powers of ten over a wide span", () => {
    expect(logScale([0.5, 2000], [0, 100]).ticks()).toEqual([1, 10, 100, 1000]);
  });
  it("formats large and small numbers in exponent form", () => {
    expect(formatTick(250000)).toBe("2.5e5");
    expect(formatTick(0.0001)).toBe("1e-4");
    expect(formatTick(12.3456)).toBe("12.35");
  });
});

describe("viridis", () => {
  it("matches matplotlib's end points (matplotlib 3.6.3 viridis: (68,1,84) and (253,231,37))", () => {
    expect(viridis(0)).toEqual([68, 1, 84]);
    expect(viridis(1)).toEqual([253, 231, 37]);
  });
  it("rises monotonically in luminance, so it reads in greyscale (van der Walt & Smith 2015 design goal)", () => {
    // relative luminance of linearised sRGB (IEC 61966-2-1 transfer function; Rec. 709 primaries' Y weights)
    const lin = (c: number): number => { const u = c / 255; return u <= 0.04045 ? u / 12.92 : ((u + 0.055) / 1.055) ** 2.4; };
    // matplotlib's float table is strictly monotonic; rounding to 8 bits may undo a step by less than
    // one quantisation level (≈ 1e-3 in luminance), so allow only drops smaller than that.
    let prev = -1;
    let worstDrop = 0;
    for (let i = 0; i <= 255; i++) {
      const [r, g, b] = viridis(i / 255);
      const lum = 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b);
      worstDrop = Math.max(worstDrop, prev - lum);
      prev = lum;
    }
    expect(worstDrop).toBeLessThan(1e-3);
    const lumAt = (t: number): number => { const [r, g, b] = viridis(t); return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b); };
    for (let k = 1; k <= 16; k++) expect(lumAt(k / 16)).toBeGreaterThan(lumAt((k - 1) / 16));
  });
});

describe("mapToPng", () => {
  it("writes an RGB PNG of the map's size with row 0 at the bottom", () => {
    const nx = 4, ny = 3;
    const data = new Float64Array(nx * ny);
    data[0] = 1; // pixel (0,0): bottom-left → brightest
    const png = decode(mapToPng(data, nx, ny, 0, 1));
    expect([png.width, png.height, png.channels]).toEqual([4, 3, 3]);
    const bottomLeft = ((ny - 1) * nx) * 3;
    expect(Array.from(png.data.slice(bottomLeft, bottomLeft + 3))).toEqual([253, 231, 37]);
    expect(Array.from(png.data.slice(0, 3))).toEqual([68, 1, 84]);
  });
});

describe("figures", () => {
  it("an x–y chart carries its axis labels, caption and renders to a PNG of the stated scale", () => {
    const fig = xyChart({
      name: "demo", caption: "Y measured against true Y.", x: { label: "Y_true [arcmin²]", log: true }, y: { label: "Y_meas [arcmin²]", log: true },
      series: [{ label: "clusters", x: [1e-4, 1e-3, 1e-2], y: [1.1e-4, 0.9e-3, 1e-2], yErr: [2e-5, 1e-4, 5e-4], style: "points" }], diagonal: true,
    });
    expect(fig.svg).toContain("Y_true [arcmin²]");
    expect(fig.svg).toContain("<title>Y measured against true Y.</title>");
    const png = decode(svgToPng(fig.svg, 1));
    expect([png.width, png.height]).toEqual([fig.widthPx, fig.heightPx]);
  });
  it("histogram counts values per bin, dropping NaN and out-of-range values", () => {
    expect(Array.from(histogramCounts([0.1, 0.5, 0.5, 1.9, 2, NaN, 5], [0, 1, 2]))).toEqual([3, 2]);
    const fig = histogramChart({ name: "pulls", caption: "Pulls.", values: [0, 0.1, -0.3], edges: [-1, 0, 1], x: { label: "pull" }, overlayDensity: (x) => Math.exp(-x * x / 2) / Math.sqrt(2 * Math.PI) });
    expect(fig.svg).toContain("pull");
  });
  it("a map chart embeds the raster and marks positions", () => {
    const fig = mapChart({ name: "m", caption: "A map.", data: new Float64Array(64).map((_, i) => i), nx: 8, ny: 8, pixelArcmin: 0.5, colourbarLabel: "T [µK_CMB]", markers: [{ ix: 3, iy: 4, label: "C1" }] });
    expect(fig.svg).toContain("data:image/png;base64,");
    expect(fig.svg).toContain("offset x [arcmin]");
    expect(fig.svg).toContain(">C1<");
    expect(() => svgToPng(fig.svg, 1)).not.toThrow();
  });
  it("the HTML report escapes text and links each figure with its caption", () => {
    const fig = xyChart({ name: "f", caption: "a < b", x: { label: "x" }, y: { label: "y" }, series: [{ x: [0, 1], y: [0, 1] }] });
    const html = renderHtmlReport("R & D", [{ kind: "figure", figure: fig, src: "figures/f.svg" }, { kind: "table", columns: ["id", "y0"], rows: [["C1", 1.23e-5]] }]);
    expect(html).toContain("<title>R &amp; D</title>");
    expect(html).toContain('<img src="figures/f.svg"');
    expect(html).toContain("<figcaption>a &lt; b</figcaption>");
    expect(html).toContain("<td>1.230e-5</td>");
  });
});

describe("stampGrid", () => {
  it("lays out rows × columns with labels and renders", async () => {
    const { stampGrid } = await import("../src/index.js");
    const s = { data: new Float64Array(16).map((_, i) => i), nx: 4, ny: 4 };
    const fig = stampGrid({ name: "st", caption: "Stamps.", stamps: [[s, null], [s, s]], rowLabels: ["C1", "C2"], columnLabels: ["f090 [µK]", "f150 [µK]"] });
    expect(fig.svg.match(/<image /g)?.length).toBe(3);
    expect(fig.svg).toContain(">C2<");
    expect(fig.svg).toContain("f150 [µK]");
    expect(() => svgToPng(fig.svg, 1)).not.toThrow();
  });
});
