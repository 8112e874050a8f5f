/**
 * Truth tables of a simulated field as rows for CSV: the clusters in the cluster-catalogue format
 * of @umbra/maps (id, ra_deg, dec_deg, theta500_arcmin, z, m500_msun, te_kev, then the extra
 * truth columns), and the radio sources.
 */
import { formatCsvNumber, type ClusterRow, type CsvValue } from "@umbra/maps";
import type { TrueCluster } from "../sky/clusterTruth.js";
import type { TrueRadioSource } from "../sky/radio.js";

/** Extra truth columns after the standard catalogue columns, in order. */
export const CLUSTER_TRUTH_EXTRA_COLUMNS = ["x_pix", "y_pix", "y0", "y5r500_arcmin2", "v_los_kms", "tau0", "in_field", "near_edge"] as const;

/** Catalogue rows of the true clusters (numbers written shortest-round-trip). */
export function clusterTruthRows(clusters: readonly TrueCluster[]): ClusterRow[] {
  return clusters.map((c) => ({
    id: c.id,
    raDeg: c.raDeg,
    decDeg: c.decDeg,
    theta500Arcmin: c.theta500Arcmin,
    z: c.z,
    m500Msun: c.m500Msun,
    teKeV: c.kTeKeV,
    extra: {
      x_pix: formatCsvNumber(c.xPix),
      y_pix: formatCsvNumber(c.yPix),
      y0: formatCsvNumber(c.y0),
      y5r500_arcmin2: formatCsvNumber(c.y5r500Arcmin2),
      v_los_kms: formatCsvNumber(c.vLosKmS),
      tau0: formatCsvNumber(c.tau0),
      in_field: c.inField ? "1" : "0",
      near_edge: c.nearEdge ? "1" : "0",
    },
  }));
}

/** Columns of the radio truth table. */
export const RADIO_TRUTH_COLUMNS = ["id", "ra_deg", "dec_deg", "x_pix", "y_pix", "flux_jy_ref", "alpha", "host_cluster"] as const;

/** Rows of the radio truth table. */
export function radioTruthRows(sources: readonly TrueRadioSource[]): Record<string, CsvValue>[] {
  return sources.map((s) => ({
    id: s.id,
    ra_deg: s.raDeg,
    dec_deg: s.decDeg,
    x_pix: s.xPix,
    y_pix: s.yPix,
    flux_jy_ref: s.fluxJyRef,
    alpha: s.alpha,
    host_cluster: s.hostClusterId,
  }));
}
