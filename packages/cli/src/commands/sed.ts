/**
 * `umbra sed`: print a sky component's response per unit amplitude in each band (delta
 * frequencies or tabulated bandpasses) in one map unit. tSZ per unit y (relativistic with
 * --te-kev), kSZ per unit τ·v/c, CMB per K_CMB, dust/CIB/radio per MJy/sr at --ref-ghz.
 */
import type { Command } from "commander";
import { UmbraError, isMapUnit, isUmbraError } from "@umbra/core";
import { readNumericTable } from "@umbra/maps";
import type { MapUnit } from "@umbra/core";
import { COMPONENT_KINDS, componentEffectiveFrequency, componentResponse, bandReferenceFrequency } from "@umbra/spectra";
import type { BandSpec, Bandpass, ComponentSpec } from "@umbra/spectra";

interface SedOptions {
  component: string;
  freq?: string;
  teKev?: string;
  unit: string;
  bandpass?: string[];
  beta: string;
  tdK: string;
  alpha: string;
  refGhz: string;
  redshift: string;
  beamSr?: string;
  json?: boolean;
}

function number(name: string, text: string): number {
  const v = Number(text);
  if (text.trim() === "" || !Number.isFinite(v)) throw new UmbraError("BAD_OPTION", `--${name} '${text}' is not a number`, { field: name, value: text });
  return v;
}

function parseFrequencies(text: string): number[] {
  return text.split(",").map((s) => {
    const f = number("freq", s.trim());
    if (f <= 0) throw new UmbraError("BAD_OPTION", `--freq ${s.trim()} GHz must be positive`, { field: "freq", value: f });
    return f;
  });
}

/**
 * Read a two-column bandpass table (frequency in GHz, transmission weight) with @umbra/maps'
 * numeric-table reader. A malformed table is the user's input, so BAD_DATA becomes BAD_VALUE
 * (exit 2), keeping the file and row.
 */
export async function readBandpassTable(path: string): Promise<Bandpass> {
  try {
    const [frequencyGHz, weight] = await readNumericTable(path, 2);
    return { frequencyGHz: frequencyGHz as Float64Array, weight: weight as Float64Array, name: path };
  } catch (e) {
    if (isUmbraError(e, "BAD_DATA")) {
      throw new UmbraError("BAD_VALUE", e.message.replace(/^.*?: /, "bandpass table: "), e.place);
    }
    throw e;
  }
}

function componentFrom(o: SedOptions): ComponentSpec {
  const kind = o.component;
  if (!(COMPONENT_KINDS as readonly string[]).includes(kind)) {
    throw new UmbraError("BAD_OPTION", `unknown component '${kind}' (expected ${COMPONENT_KINDS.join(", ")})`, { field: "component", value: kind });
  }
  const ref = number("ref-ghz", o.refGhz);
  switch (kind) {
    case "tsz":
      return { kind, kTeKeV: o.teKev === undefined ? 0 : number("te-kev", o.teKev) };
    case "ksz":
    case "cmb":
      return { kind };
    case "dust":
      return { kind, beta: number("beta", o.beta), temperatureK: number("td-k", o.tdK), refFrequencyGHz: ref };
    case "cib":
      return { kind, beta: number("beta", o.beta), temperatureK: number("td-k", o.tdK), redshift: number("redshift", o.redshift), refFrequencyGHz: ref };
    default:
      return { kind: "radio", alpha: number("alpha", o.alpha), refFrequencyGHz: ref };
  }
}

const AMPLITUDE: Record<string, string> = {
  tsz: "unit Compton-y",
  ksz: "unit tau*v/c (v > 0 receding)",
  cmb: "K_CMB",
  dust: "MJy/sr at the reference frequency",
  cib: "MJy/sr at the reference frequency",
  radio: "MJy/sr at the reference frequency",
};

async function sedAction(o: SedOptions): Promise<void> {
  const component = componentFrom(o);
  if (!isMapUnit(o.unit)) {
    throw new UmbraError("BAD_OPTION", `unknown unit '${o.unit}' (expected K_CMB, uK_CMB, K_RJ, MJy/sr or Jy/beam)`, { field: "unit", value: o.unit });
  }
  const unit: MapUnit = o.unit;
  const beamSolidAngleSr = o.beamSr === undefined ? undefined : number("beam-sr", o.beamSr);
  if (unit === "Jy/beam" && beamSolidAngleSr === undefined) {
    throw new UmbraError("BAD_OPTION", "--unit Jy/beam needs --beam-sr (the beam solid angle in sr)", { field: "beam-sr" });
  }
  const bands: { band: BandSpec; file?: string }[] = [];
  if (o.freq !== undefined) for (const f of parseFrequencies(o.freq)) bands.push({ band: { frequencyGHz: f } });
  for (const file of o.bandpass ?? []) bands.push({ band: { bandpass: await readBandpassTable(file) }, file });
  if (bands.length === 0) throw new UmbraError("BAD_OPTION", "give --freq and/or --bandpass", { field: "freq" });

  const opts = beamSolidAngleSr === undefined ? {} : { beamSolidAngleSr };
  const values = bands.map(({ band, file }) => {
    const row: { frequency_ghz: number; response: number; bandpass?: string; effective_frequency_ghz?: number } = {
      frequency_ghz: bandReferenceFrequency(band),
      response: componentResponse(component, band, unit, opts),
    };
    if (file !== undefined) {
      row.bandpass = file;
      row.effective_frequency_ghz = componentEffectiveFrequency(component, band);
    }
    return row;
  });
  const teKev = component.kind === "tsz" ? (component.kTeKeV ?? 0) : null;
  if (o.json) {
    const out: Record<string, unknown> = { component: component.kind, unit, te_kev: teKev, values };
    if (component.kind !== "tsz" && component.kind !== "ksz" && component.kind !== "cmb") out.parameters = { ...component };
    process.stdout.write(`${JSON.stringify(out, null, 2)}\n`);
    return;
  }
  const lines = [`# ${component.kind} response in ${unit} per ${AMPLITUDE[component.kind] ?? "unit amplitude"}${teKev !== null && teKev > 0 ? ` (kTe = ${teKev} keV)` : ""}`];
  lines.push("frequency_GHz\tresponse");
  for (const v of values) lines.push(`${v.frequency_ghz.toPrecision(6)}\t${v.response.toPrecision(8)}${v.bandpass !== undefined ? `\t# ${v.bandpass}, effective ${v.effective_frequency_ghz?.toPrecision(6)} GHz` : ""}`);
  process.stdout.write(`${lines.join("\n")}\n`);
}

/** Register `umbra sed`. */
export function register(program: Command): void {
  program
    .command("sed")
    .description("print a sky component's response per unit amplitude in each band and unit")
    .requiredOption("--component <name>", `component: ${COMPONENT_KINDS.join("|")}`)
    .option("--freq <GHz,...>", "comma-separated delta-band frequencies in GHz")
    .option("--bandpass <file...>", "two-column bandpass tables (GHz, transmission)")
    .option("--te-kev <keV>", "tSZ electron temperature (relativistic when > 0)")
    .option("--unit <unit>", "K_CMB|uK_CMB|K_RJ|MJy/sr|Jy/beam", "K_CMB")
    .option("--beam-sr <sr>", "beam solid angle in steradians (needed for Jy/beam)")
    .option("--beta <beta>", "dust/CIB emissivity index", "1.6")
    .option("--td-k <K>", "dust/CIB temperature in K", "20")
    .option("--redshift <z>", "CIB effective redshift", "0")
    .option("--alpha <alpha>", "radio spectral index (S ∝ nu^alpha)", "-0.7")
    .option("--ref-ghz <GHz>", "reference frequency of dust/CIB/radio amplitudes", "150")
    .option("--json", "print JSON")
    .action(async (o: SedOptions) => sedAction(o));
}
