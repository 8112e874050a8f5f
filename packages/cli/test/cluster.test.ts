import { afterEach, describe, expect, it } from "vitest";
import { readFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { capture } from "./capture.js";

interface CosmoRef {
  name: string;
  z: number[];
  angular_diameter_mpc: number[];
  efunc: number[];
}
const REF = JSON.parse(readFileSync(fileURLToPath(new URL("../../../fixtures/clusters/reference.json", import.meta.url)), "utf8")) as {
  cosmologies: CosmoRef[];
};


afterEach(() => {
  process.exitCode = undefined;
});

describe("umbra cluster", () => {
  it("--json gives the documented keys; D_A and E(z) agree with astropy 5.2.1 (fixtures/clusters/reference.json) to 1e-6", async () => {
    const { code, out } = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--json"]);
    expect(code).toBe(0);
    const j = JSON.parse(out) as Record<string, number>;
    for (const k of ["d_a_mpc", "e_z", "r500_mpc", "theta500_arcmin", "p500_kev_cm3", "y_sph_r500_mpc2", "y_sph_5r500_mpc2", "y_cyl_r500_mpc2", "y5r500_arcmin2", "y0"]) {
      expect(typeof j[k]).toBe("number");
    }
    const ref = REF.cosmologies.find((c) => c.name === "concordance")!;
    const i = ref.z.indexOf(0.5);
    expect(j.d_a_mpc).toAllClose(ref.angular_diameter_mpc[i]!, { rtol: 1e-6 });
    expect(j.e_z).toAllClose(ref.efunc[i]!, { rtol: 1e-6 });
    // θ500 = R500/D_A
    expect(j.theta500_arcmin).toAllClose(((j.r500_mpc! / j.d_a_mpc!) * 180 * 60) / Math.PI, { rtol: 1e-12 });
    // A10 ratios: Y_cyl(R500)/Y_sph(R500) ≈ 1.203 and Y_sph(5R500)/Y_sph(R500) ≈ 1.796 (Arnaud et al. 2010, eq. 25 and Sect. 6; from memory)
    expect(j.y_cyl_r500_mpc2! / j.y_sph_r500_mpc2!).toAllClose(1.203, { rtol: 1e-3 });
    expect(j.y_sph_5r500_mpc2! / j.y_sph_r500_mpc2!).toAllClose(1.1037 / 0.6145, { rtol: 2e-3 });
    // Y5R500 is Y_sph(5R500) seen on the sky
    expect(j.y5r500_arcmin2).toAllClose(j.y_sph_5r500_mpc2! / j.d_a_mpc! ** 2 * (180 * 60 / Math.PI) ** 2, { rtol: 1e-9 });
  });

  it("--bands with --kte 0 gives the non-relativistic tSZ response T0 (x coth(x/2) − 4) per y (Sunyaev & Zeldovich 1972; Carlstrom et al. 2002, ARA&A 40, 643, eq. 2)", async () => {
    const { code, out } = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--bands", "150,353", "--kte", "0", "--json"]);
    expect(code).toBe(0);
    const j = JSON.parse(out) as { y0: number; bands: { frequency_ghz: number; tsz_uk_cmb_per_y: number; central_uk_cmb: number }[] };
    const T0 = 2.7255; // Fixsen 2009, ApJ 707, 916
    const xOf = (ghz: number): number => (6.62607015e-34 * ghz * 1e9) / (1.380649e-23 * T0);
    const want = [150, 353].map((f) => {
      const x = xOf(f);
      return T0 * 1e6 * (x / Math.tanh(x / 2) - 4);
    });
    expect(j.bands.map((b) => b.tsz_uk_cmb_per_y)).toAllClose(want, { rtol: 1e-6 });
    expect(j.bands[0]!.central_uk_cmb).toAllClose(want[0]! * j.y0, { rtol: 1e-12 });
  });

  it("prints a readable text summary, and --alpha-p-prime changes the profile", async () => {
    const a = await capture(["cluster", "--m500", "6e14", "--z", "0.5"]);
    expect(a.code).toBe(0);
    expect(a.out).toMatch(/theta500\s+2\.9\d* +arcmin/);
    expect(a.out).toMatch(/Y5R500\s/);
    const b = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--alpha-p-prime", "--json"]);
    const c = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--json"]);
    const yb = (JSON.parse(b.out) as { y0: number }).y0;
    const yc = (JSON.parse(c.out) as { y0: number }).y0;
    expect(Math.abs(yb / yc - 1)).toBeGreaterThan(1e-3);
  });

  it("rejects bad input with exit code 2 and names the value", async () => {
    const neg = await capture(["cluster", "--m500", "-6e14", "--z", "0.5"]);
    expect(neg.code).toBe(2);
    expect(neg.err).toMatch(/m500 = -600000000000000/);
    const zero = await capture(["cluster", "--m500", "0", "--z", "0.5"]);
    expect(zero.code).toBe(2);
    const negZ = await capture(["cluster", "--m500", "6e14", "--z", "-0.2"]);
    expect(negZ.code).toBe(2);
    expect(negZ.err).toMatch(/z = -0.2/);
    const cos = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--cosmology", "lcdm-best"]);
    expect(cos.code).toBe(2);
    expect(cos.err).toMatch(/unknown cosmology preset 'lcdm-best'/);
    const prof = await capture(["cluster", "--m500", "6e14", "--z", "0.5", "--profile", "xyz"]);
    expect(prof.code).toBe(2);
    expect(prof.err).toMatch(/unknown profile parameter set 'xyz'/);
    const nan = await capture(["cluster", "--m500", "lots", "--z", "0.5"]);
    expect(nan.code).toBe(2);
    expect(nan.err).toMatch(/--m500 'lots' is not a number/);
  });
});
