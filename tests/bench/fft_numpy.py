"""Time numpy's float64 real 2-D FFT round trip (rfft2 + irfft2) for comparison with tests/bench/fft.ts.

Run from the repository root with the default python3 (numpy 2.4.6 was used):
    python3 tests/bench/fft_numpy.py [--quick]
numpy's pocketfft is single-threaded for these calls (OPENBLAS_NUM_THREADS etc. do not affect it).
Prints one JSON object: median wall-clock and CPU seconds per round trip for each shape, and the peak RSS of six
4096² float64 bands transformed in turn (each band's spectrum dropped before the next).
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
    np.fft.irfft2(np.fft.rfft2(m), s=m.shape)  # warm-up
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


def peak_six_bands() -> float:
    rng = np.random.default_rng(2)
    bands = [rng.standard_normal((4096, 4096)) for _ in range(6)]
    for b in bands:
        b[:] = np.fft.irfft2(np.fft.rfft2(b), s=b.shape)
    return resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0  # MB on Linux


def main() -> None:
    quick = "--quick" in sys.argv
    rows = []
    for ny, nx in SHAPES:
        if quick and nx * ny > 2048 * 2048:
            continue
        reps = 3 if quick else (5 if nx * ny >= 4096 * 4096 else 11)
        wall, cpu = median_times(ny, nx, reps)
        rows.append({"nx": nx, "ny": ny, "roundTripSeconds": wall, "roundTripCpuSeconds": cpu})
    out = {"library": f"numpy {np.__version__}", "rows": rows}
    if not quick:
        out["peakRssMBSixBands4096"] = peak_six_bands()
    print(json.dumps(out, indent=1))


if __name__ == "__main__":
    main()
