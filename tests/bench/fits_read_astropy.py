#!/usr/bin/python3
"""Time astropy reading a FITS image, for comparison with umbra's reader (tests/bench/fits-read.ts).

Run with Debian's astropy (5.2.1):
    /usr/bin/python3 tests/bench/fits_read_astropy.py FILE [REPEATS]

Times, in milliseconds, `fits.open(FILE, memmap=False)` + `.data` access + close (astropy's
big-endian array as stored, no conversion: "data"), the same followed by `.astype(float32)` in
native byte order ("native_float32": the array umbra's `dtype: "float32"` read returns), and followed
by `.astype(numpy.float64)` ("float64": the array umbra's default read returns). Prints one JSON
object: per kind, the first read in this process, the median and the minimum over REPEATS further
reads (default 7); and the library versions.
"""
import json
import sys
import time

import numpy as np
import astropy
from astropy.io import fits


def read_once(path, dtype):
    t0 = time.perf_counter()
    with fits.open(path, memmap=False) as hl:
        data = hl[0].data
        if dtype is not None:
            data = data.astype(dtype)
        _ = data[0, 0]
    return (time.perf_counter() - t0) * 1e3


def main():
    path = sys.argv[1]
    repeats = int(sys.argv[2]) if len(sys.argv) > 2 else 7
    out = {"file": path, "repeats": repeats, "astropy": astropy.__version__, "numpy": np.__version__}
    kinds = (("data", None), ("native_float32", np.dtype("float32").newbyteorder("=")), ("float64", np.float64))
    for key, dtype in kinds:
        first = read_once(path, dtype)
        times = [read_once(path, dtype) for _ in range(repeats)]
        out[key] = {"first_ms": first, "median_ms": float(np.median(times)), "min_ms": float(np.min(times))}
    print(json.dumps(out))


if __name__ == "__main__":
    main()
