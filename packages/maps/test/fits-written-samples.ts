/**
 * The images our FITS writer writes for the astropy cross-check: used by fixtures/fits/write_samples.ts
 * (which writes fixtures/fits/written_*.fits for fixtures/fits/check_written.py) and by the tests
 * (which check the writer still produces those exact bytes). Invented values only.
 */
import type { FitsImageHdu, WriteFitsOptions } from "../src/fits/index.js";
import type { Wcs } from "../src/wcs/types.js";

export const SAMPLE_WCS: Wcs = {
  ctype: ["RA---TAN", "DEC--TAN"],
  projection: "TAN",
  lonAxis: 0,
  crpix: [4, 3],
  crval: [150.125, 2.25],
  cd: [-0.008333333333333333, 0, 0, 0.008333333333333333],
  lonpole: 180,
  latpole: 2.25,
  pv: {},
  radesys: "ICRS",
  equinox: null,
};

function ramp(nx: number, ny: number, scale: number, offset: number): Float64Array {
  const d = new Float64Array(nx * ny);
  for (let y = 0; y < ny; y++) for (let x = 0; x < nx; x++) d[y * nx + x] = offset + scale * (1.5 * x - 2.25 * y + 0.125 * x * y) + Math.PI * 1e-3 * ((x * 7 + y * 3) % 5);
  return d;
}

/** name → what to write. */
export function writtenSamples(): Record<string, { hdus: FitsImageHdu[]; options: WriteFitsOptions }> {
  const a = ramp(7, 5, 1e-5, 0);
  a[1 * 7 + 2] = NaN;
  const b = ramp(7, 5, 1e-6, 0);
  const c = ramp(6, 4, 2, 100);
  const m = new Float32Array(6 * 4).map((_, i) => (i % 3 === 0 ? 1 : 0));
  return {
    "written_f64_wcs.fits": {
      hdus: [{ data: a, nx: 7, ny: 5, wcs: SAMPLE_WCS, bunit: "K_CMB", cards: [{ keyword: "FIELD", value: "DEMO-FIELD-07", comment: "invented field id" }] }],
      options: {
        provenance: {
          tool: "umbra",
          version: "0.1.0",
          settings: { beamFwhmArcmin: [7.22, 4.9, 4.68], apodisationArcmin: 30, filter: "matched", note: "settings long enough to need CONTINUE cards, it's quoted" },
          inputs: [
            { file: "maps/band_150GHz.fits", sha256: "3f79bb7b435b05321651daefd374cdc681dc06faa65e374e38337b88ca046dea" },
            { file: "catalogue/clusters_demo_field_with_a_rather_long_name_that_needs_more_than_one_card.csv", sha256: "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855" },
          ],
        },
      },
    },
    "written_multi.fits": {
      hdus: [
        { data: Float32Array.from(b), nx: 7, ny: 5, wcs: SAMPLE_WCS, bunit: "", extname: "YMAP" },
        { data: c, nx: 6, ny: 4, bitpix: -64, bunit: "uK_CMB", extname: "NOISE" },
        { data: m, nx: 6, ny: 4, extname: "MASK", cards: [{ commentary: "HISTORY", text: "mask of invented point sources" }] },
      ],
      options: {},
    },
  };
}
