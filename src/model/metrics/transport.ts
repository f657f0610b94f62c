/** Metrics of the transport analyses (registered in src/model/metrics.ts). */
import { metric, type MetricSpec } from "../metricSpec.ts";

export const TRANSPORT_DEPTH_METRICS: MetricSpec[] = [
  metric(
    "percolation_density",
    "Percolation density",
    "cm^-2",
    1e-4,
    "transport",
    "n_p of σ = A·(n − n_p)^p fitted to the zero-field gate sweep (up sweep preferred)",
  ),
  metric("mobility_exponent", "Mobility exponent α", "1", 1, "transport", "α of μ ∝ n^α over the exponent density range (default: below the mobility peak)"),
  metric(
    "hall_sdh_mismatch",
    "Hall–SdH density mismatch",
    "%",
    1,
    "transport",
    "largest |n_Hall − n_SdH|/n_SdH over the field sweeps; large values point to a parallel conducting channel",
    2,
  ),
  metric("gate_capacitance", "Gate capacitance", "uF/cm^2", 100, "transport", "C = e·dn/dVg from the Hall densities (linear fit)"),
  metric("gate_hysteresis", "Gate hysteresis", "V", 1, "transport", "|mean Vg shift| between up and down zero-field gate sweeps at equal resistance", 2),
  metric(
    "quantum_lifetime",
    "Quantum lifetime τ_q",
    "ps",
    1e12,
    "transport",
    "median τ_q over the field sweeps where it is determined, from a least-squares fit of the Lifshitz–Kosevich form to the SdH oscillations",
  ),
  metric(
    "scattering_time_ratio",
    "Scattering-time ratio τ_t/τ_q",
    "1",
    1,
    "transport",
    "median τ_t/τ_q over the field sweeps with both lifetimes: ≫ 1 when remote ionised impurities (small-angle scattering) dominate, ≈ 1 for short-range scattering (Das Sarma & Stern 1985)",
  ),
];
