/**
 * `umbra cluster`: what to expect from one cluster of mass M500 at redshift z — distances, size,
 * pressure scale, the integrated Y in its usual definitions, the central Compton y, a temperature
 * from the M–T relation and, with `--bands`, the expected tSZ signal per band.
 */
import type { Command } from "commander";
import { UmbraError, requireFinite } from "@umbra/core";
import {
  centralY,
  clusterScale,
  cosmologyPreset,
  gnfwA10,
  gnfwParameterSet,
  mpc2ToArcmin2At,
  temperatureFromMassKeV,
  y5r500Arcmin2,
  yCylMpc2,
  ySphMpc2,
  type Cosmology,
  type PressureProfile,
} from "@umbra/clusters";
import { componentResponse } from "@umbra/spectra";

/** Options as commander hands them over. */
interface ClusterCliOptions {
  m500: string;
  z: string;
  cosmology: string;
  profile: string;
  alphaPPrime?: boolean;
  bands?: string;
  kte?: string;
  json?: boolean;
}

/** One band's expected signal. */
export interface BandSignal {
  frequency_ghz: number;
  /** tSZ response in µK_CMB per unit y (relativistic at kte_kev). */
  tsz_uk_cmb_per_y: number;
  /** Central (unconvolved) temperature decrement/increment, µK_CMB. */
  central_uk_cmb: number;
  /** Y5R500 times the response, µK_CMB·arcmin². */
  integrated_uk_cmb_arcmin2: number;
}

/** The numbers `umbra cluster` reports (also its `--json` output). */
export interface ClusterSummary {
  m500_msun: number;
  z: number;
  cosmology: string;
  profile: string;
  d_a_mpc: number;
  e_z: number;
  r500_mpc: number;
  theta500_arcmin: number;
  p500_kev_cm3: number;
  y_sph_r500_mpc2: number;
  y_sph_5r500_mpc2: number;
  y_cyl_r500_mpc2: number;
  y_sph_r500_arcmin2: number;
  y_sph_5r500_arcmin2: number;
  y_cyl_r500_arcmin2: number;
  y5r500_arcmin2: number;
  y0: number;
  y5r500_over_y0_arcmin2: number;
  kte_kev: number;
  kte_source: "option" | "M-T relation (Arnaud et al. 2005)";
  bands: BandSignal[];
}

function parseNumber(name: string, text: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v)) throw new UmbraError("BAD_VALUE", `--${name} '${text}' is not a number`, { field: name, value: text });
  return v;
}

function profileFor(name: string, m500Msun: number, h70: number, alphaPPrime: boolean): PressureProfile {
  const params = gnfwParameterSet(name); // BAD_VALUE naming an unknown set
  return gnfwA10({ m500Msun, h70, alphaPPrime, params, ...(name === "a10" ? {} : { label: name }) });
}

/** Compute the summary for one cluster (exported for tests and other commands). */
export function summariseCluster(opts: {
  m500Msun: number;
  z: number;
  cosmo: Cosmology;
  profileName?: string;
  alphaPPrime?: boolean;
  bandsGHz?: readonly number[];
  kTeKeV?: number;
}): ClusterSummary {
  const m = requireFinite("m500", opts.m500Msun, (v) => v > 0, "not a positive mass (M500 in Msun)");
  const z = requireFinite("z", opts.z, (v) => v > 0, "not above 0 (a cluster needs a distance)");
  const cosmo = opts.cosmo;
  const profile = profileFor(opts.profileName ?? "a10", m, cosmo.h70, opts.alphaPPrime === true);
  const s = clusterScale(m, z, cosmo);
  const ySph1 = ySphMpc2(profile, s, 1);
  const ySph5 = ySphMpc2(profile, s, 5);
  const yCyl1 = yCylMpc2(profile, s, 1);
  const y0 = centralY(profile, s);
  const y5 = y5r500Arcmin2(profile, s);
  const kte = opts.kTeKeV !== undefined ? requireFinite("kte", opts.kTeKeV, (v) => v >= 0, "negative") : temperatureFromMassKeV(m, z, cosmo);
  const bands = (opts.bandsGHz ?? []).map((f) => {
    const r = componentResponse({ kind: "tsz", kTeKeV: kte }, { frequencyGHz: f }, "uK_CMB");
    return { frequency_ghz: f, tsz_uk_cmb_per_y: r, central_uk_cmb: r * y0, integrated_uk_cmb_arcmin2: r * y5 };
  });
  return {
    m500_msun: m,
    z,
    cosmology: cosmo.label,
    profile: profile.label,
    d_a_mpc: s.dAMpc,
    e_z: s.eZ,
    r500_mpc: s.r500Mpc,
    theta500_arcmin: s.theta500Arcmin,
    p500_kev_cm3: s.p500KeVCm3,
    y_sph_r500_mpc2: ySph1,
    y_sph_5r500_mpc2: ySph5,
    y_cyl_r500_mpc2: yCyl1,
    y_sph_r500_arcmin2: mpc2ToArcmin2At(s, ySph1),
    y_sph_5r500_arcmin2: mpc2ToArcmin2At(s, ySph5),
    y_cyl_r500_arcmin2: mpc2ToArcmin2At(s, yCyl1),
    y5r500_arcmin2: y5,
    y0,
    y5r500_over_y0_arcmin2: y5 / y0,
    kte_kev: kte,
    kte_source: opts.kTeKeV !== undefined ? "option" : "M-T relation (Arnaud et al. 2005)",
    bands,
  };
}

const g = (v: number, digits = 4): string => (Math.abs(v) >= 1e-3 && Math.abs(v) < 1e5 ? v.toPrecision(digits) : v.toExponential(digits - 1));

function formatText(c: ClusterSummary): string {
  const rows: [string, string, string][] = [
    ["D_A", g(c.d_a_mpc, 6), "Mpc"],
    ["E(z)", g(c.e_z, 6), ""],
    ["R500", g(c.r500_mpc), "Mpc"],
    ["theta500", g(c.theta500_arcmin), "arcmin"],
    ["P500", g(c.p500_kev_cm3), "keV cm^-3"],
    ["Y_sph(R500)", `${g(c.y_sph_r500_mpc2)} Mpc^2`, `${g(c.y_sph_r500_arcmin2)} arcmin^2`],
    ["Y_sph(5R500)", `${g(c.y_sph_5r500_mpc2)} Mpc^2`, `${g(c.y_sph_5r500_arcmin2)} arcmin^2`],
    ["Y_cyl(R500)", `${g(c.y_cyl_r500_mpc2)} Mpc^2`, `${g(c.y_cyl_r500_arcmin2)} arcmin^2`],
    ["Y5R500", g(c.y5r500_arcmin2), "arcmin^2"],
    ["y0 (central)", g(c.y0), ""],
    ["Y5R500 / y0", g(c.y5r500_over_y0_arcmin2), "arcmin^2"],
    ["kTe", g(c.kte_kev), `keV (${c.kte_source})`],
  ];
  const w = Math.max(...rows.map((r) => r[0].length));
  const lines = [`cluster M500 = ${g(c.m500_msun)} Msun at z = ${c.z}  [cosmology ${c.cosmology}; profile ${c.profile}]`];
  for (const [k, v, u] of rows) lines.push(`  ${k.padEnd(w)}  ${v}${u ? `  ${u}` : ""}`);
  if (c.bands.length > 0) {
    lines.push("  expected tSZ signal (unconvolved):");
    lines.push(`    ${"GHz".padStart(8)}  ${"uK_CMB per y".padStart(14)}  ${"central uK_CMB".padStart(14)}  ${"Y5R500 uK.arcmin^2".padStart(18)}`);
    for (const b of c.bands) {
      lines.push(
        `    ${g(b.frequency_ghz, 5).padStart(8)}  ${g(b.tsz_uk_cmb_per_y, 6).padStart(14)}  ${g(b.central_uk_cmb, 5).padStart(14)}  ${g(b.integrated_uk_cmb_arcmin2, 5).padStart(18)}`,
      );
    }
  }
  return `${lines.join("\n")}\n`;
}

function parseBands(text: string): number[] {
  return text.split(",").map((t) => {
    const f = parseNumber("bands", t.trim());
    return requireFinite("bands", f, (v) => v > 0, "not a positive frequency in GHz");
  });
}

/** Register `umbra cluster`. */
export function register(program: Command): void {
  program
    .command("cluster")
    .description("What to expect from one cluster: size, Y in its usual definitions, central y, kTe, tSZ signal per band.")
    .requiredOption("--m500 <msun>", "M500 (critical) in solar masses, e.g. 6e14")
    .requiredOption("--z <redshift>", "redshift (> 0)")
    .option("--cosmology <name>", "cosmology preset: concordance | cmb2018", "concordance")
    .option("--profile <name>", "pressure profile: a10 (Arnaud et al. 2010 universal), a10-cool-core, a10-disturbed", "a10")
    .option("--alpha-p-prime", "add the A10 radius-dependent mass term alpha'_P(x)")
    .option("--bands <GHz,...>", "comma-separated band centres in GHz for the expected tSZ signal")
    .option("--kte <keV>", "electron temperature for the relativistic tSZ (default: from the M-T relation)")
    .option("--json", "print JSON instead of text")
    .action((o: ClusterCliOptions) => {
      const summary = summariseCluster({
        m500Msun: parseNumber("m500", o.m500),
        z: parseNumber("z", o.z),
        cosmo: cosmologyPreset(o.cosmology),
        profileName: o.profile,
        alphaPPrime: o.alphaPPrime === true,
        bandsGHz: o.bands !== undefined ? parseBands(o.bands) : [],
        ...(o.kte !== undefined ? { kTeKeV: parseNumber("kte", o.kte) } : {}),
      });
      process.stdout.write(o.json === true ? `${JSON.stringify(summary, null, 2)}\n` : formatText(summary));
    });
}
