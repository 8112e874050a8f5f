"""Time numpy's float64 real 2-D FFT round trip (rfft2 + irfft2) for comparison with tests/bench/fft.ts.

Run from the repository root with the default python3 (numpy 2.4.6 was used):
    python3 tests/bench/fft_numpy.py [--quick]     timings
    python3 tests/bench/fft_numpy.py --memory      memory only (its own process)
numpy's pocketfft is single-threaded for these calls (OPENBLAS_NUM_THREADS etc. do not affect it).
Prints one JSON object: median wall-clock and CPU seconds per round trip for each shape; or, with --memory,
the baseline RSS (numpy imported), the peak RSS and their difference for six 4096² float64 bands transformed
in turn (each band's spectrum dropped before the next), all in MiB.
"""
import json
import resource
import sys
import time

import numpy as np

SHAPES = [(1024, 1024), (2048, 2048), (4096, 4096), (600, 900)]  # (ny, nx)


def median_times(ny: int, nx: int, repeats: int) -> tuple[float, float]:
    """Median wall-clock and process-CPU seconds per round trip."""
    rng = np.random.default_rng(1)
    m = rng.standard_normal((ny, nx))
    for _ in range(3):  # warm-up, as tests/bench/fft.ts
        np.fft.irfft2(np.fft.rfft2(m), s=m.shape)
    times = []
    cpu = []
    for _ in range(repeats):
        c0 = time.process_time()
        t0 = time.perf_counter()
        back = np.fft.irfft2(np.fft.rfft2(m), s=m.shape)
        times.append(time.perf_counter() - t0)
        cpu.append(time.process_time() - c0)
    assert back.shape == m.shape
    return float(np.median(times)), float(np.median(cpu))


def current_rss_mb() -> float:
    """Resident set size now, MiB (Linux /proc/self/statm: pages)."""
    with open("/proc/self/statm") as f:
        pages = int(f.read().split()[1])
    return pages * resource.getpagesize() / 2**20


def peak_six_bands() -> dict:
    """Baseline RSS (numpy imported, before any map exists), peak RSS and peak - baseline (MiB) of six
    4096² float64 bands transformed in turn, each band's spectrum dropped before the next."""
    baseline = current_rss_mb()
    rng = np.random.default_rng(2)
    bands = [rng.standard_normal((4096, 4096)) for _ in range(6)]
    for b in bands:
        b[:] = np.fft.irfft2(np.fft.rfft2(b), s=b.shape)
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # KiB on Linux
    return {"baselineRssMB": baseline, "peakRssMB": peak, "dataMB": peak - baseline}


def main() -> None:
    if "--memory" in sys.argv:
        # memory only, in a fresh process, so the peak is the six bands' own
        print(json.dumps({"library": f"numpy {np.__version__}", "sixBands4096": peak_six_bands()}, indent=1))
        return
    quick = "--quick" in sys.argv
    rows = []
    for ny, nx in SHAPES:
        if quick and nx * ny > 2048 * 2048:
            continue
        reps = 3 if quick else (5 if nx * ny >= 4096 * 4096 else 11)
        wall, cpu = median_times(ny, nx, reps)
        rows.append({"nx": nx, "ny": ny, "roundTripSeconds": wall, "roundTripCpuSeconds": cpu})
    print(json.dumps({"library": f"numpy {np.__version__}", "rows": rows}, indent=1))


if __name__ == "__main__":
    main()
