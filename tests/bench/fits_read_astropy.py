#!/usr/bin/python3
"""Time astropy reading a FITS image, for comparison with umbra's reader (tests/bench/fits-read.ts).

Run with Debian's astropy (5.2.1):
    /usr/bin/python3 tests/bench/fits_read_astropy.py FILE [REPEATS]

Times, in milliseconds, `fits.open(FILE, memmap=False)` + `.data` access + close (astropy's
big-endian array as stored, no conversion: "data"), the same followed by `.astype(float32)` in
native byte order ("native_float32": the array umbra's `dtype: "float32"` read returns), and followed
by `.astype(numpy.float64)` ("float64": the array umbra's default read returns).

Each kind is timed in two memory regimes: "recycled" drops every array before the next read (CPython
frees it at once and glibc hands the same, already-mapped memory to the next read), "kept" keeps
every array until the end (each read gets memory never touched before, as when a pipeline loads
several band maps). Prints one JSON object: per kind and regime, the first read in this process,
the median and the minimum over REPEATS further reads (default 7) after two untimed ones; and the library versions.
"""
import json
import sys
import time

import numpy as np
import astropy
from astropy.io import fits


def read_once(path, dtype, keep):
    t0 = time.perf_counter()
    with fits.open(path, memmap=False) as hl:
        data = hl[0].data
        if dtype is not None:
            data = data.astype(dtype)
        _ = data[0, 0]
    ms = (time.perf_counter() - t0) * 1e3
    if keep is not None:
        keep.append(data)
    return ms


def main():
    path = sys.argv[1]
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 7
    out = {"file": path, "repeats": repeats, "astropy": astropy.__version__, "numpy": np.__version__}
    kinds = (("data", None), ("native_float32", np.dtype("float32").newbyteorder("=")), ("float64", np.float64))
    for regime in ("recycled", "kept"):
        for key, dtype in kinds:
            keep = [] if regime == "kept" else None
            first = read_once(path, dtype, keep)
            for _ in range(2):  # untimed, as umbra's warm-up reads
                read_once(path, dtype, keep)
            times = [read_once(path, dtype, keep) for _ in range(repeats)]
            out[f"{key}_{regime}"] = {"first_ms": first, "median_ms": float(np.median(times)), "min_ms": float(np.min(times))}
            del keep
    print(json.dumps(out))


if __name__ == "__main__":
    main()
