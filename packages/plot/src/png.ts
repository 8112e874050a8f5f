/** SVG → PNG through resvg (a maintained Rust SVG renderer shipped as a registry package). */
import { Resvg } from "@resvg/resvg-js";

/** Render an SVG document to PNG bytes at `scale` × its own size (system fonts, white background). */
export function svgToPng(svg: string, scale = 1.5): Uint8Array {
  const r = new Resvg(svg, {
    fitTo: { mode: "zoom", value: scale },
    background: "#ffffff",
    font: { loadSystemFonts: true, defaultFontFamily: "DejaVu Sans" },
  });
  return new Uint8Array(r.render().asPng());
}
