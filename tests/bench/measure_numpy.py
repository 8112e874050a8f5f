"""Plain numpy version of umbra's single-pass forced-photometry matched filter (for the benchmark).

Run: python3 tests/bench/measure_numpy.py DIR, where DIR holds maps.f64, table.f64 and meta.json
written by tests/bench/measure.ts. Prints JSON: seconds, y0 per cluster, numpy version.

Same algorithm as packages/estimators (docs/matched-filter.md): cosine edge taper, rfft2,
beam-deconvolved cross-powers in adaptive ell bins (>= minModes full-plane modes, or at low ell
half the lower edge wide with >= 12 x bands modes), [1, 2, 1]
smoothing, diagonal loading to condition number <= 1e8, inverse covariance on a fine ell grid (1/8 of the fundamental), pre-whitening
E = Q (M/B), combination with the tSZ SED, and per cluster the direct sum over Fourier modes
y0 = b / Phi with b = sum tau(l) Re(D e^{+ik.x0}) / (Npix Omega), Phi = sum tau^2 a^T Q a / (Npix Omega^2).
"""
import json
import sys
import time

import numpy as np


def taper(n, width):
    d = np.minimum(np.arange(n) + 0.5, n - np.arange(n) - 0.5)
    w = np.ones(n)
    m = d < width
    w[m] = np.sin(np.pi * d[m] / (2 * width)) ** 2
    return w


def main(folder):
    meta = json.load(open(f"{folder}/meta.json"))
    n = meta["n"]
    nb = len(meta["sed"])
    maps = np.fromfile(f"{folder}/maps.f64", dtype="<f8").reshape(nb, n, n)
    g = np.fromfile(f"{folder}/table.f64", dtype="<f8")
    du = meta["du"]
    t0 = time.perf_counter()
    pix = meta["pixelRad"]
    omega = pix * pix
    npix = n * n
    width = min(meta["apodisationArcmin"] / (pix / np.pi * 180 * 60), n / 4)
    w1 = taper(n, width)
    win = np.outer(w1, w1)
    w2 = np.mean(win ** 2)
    spec = np.fft.rfft2(maps * win[None])
    kx = np.fft.rfftfreq(n) * n
    ky = np.fft.fftfreq(n) * n
    ell = 2 * np.pi * np.hypot(kx[None, :] / (n * pix), ky[:, None] / (n * pix))
    hw = np.full(ell.shape, 2.0)
    hw[:, 0] = 1.0
    if n % 2 == 0:
        hw[:, -1] = 1.0
    sig = np.array(meta["fwhmArcmin"]) * np.pi / (180 * 60) / np.sqrt(8 * np.log(2))
    beams = np.exp(-0.5 * ell[None] * (ell[None] + 1) * sig[:, None, None] ** 2)
    live = beams >= 1e-8
    dec = np.where(live, spec / np.where(live, beams, 1.0), 0)
    # adaptive bins
    fund = 2 * np.pi / (n * pix)
    lmax = ell.max()
    nfine = int(lmax / fund + 0.5) + 1
    fine = np.minimum(np.floor(ell / fund + 0.5).astype(int), nfine - 1)
    counts = np.bincount(fine[ell > 0].ravel(), weights=hw[ell > 0].ravel(), minlength=nfine)
    edges = [1e-9]
    acc = 0.0
    start = 0
    floor = min(meta["minModes"], 12 * nb)
    for i in range(nfine):
        acc += counts[i]
        width = (i + 1 - start) * fund
        lo = max((start - 0.5) * fund, fund)
        if acc >= meta["minModes"] or (acc >= floor and width >= 0.5 * lo):
            edges.append((i + 0.5) * fund)
            acc = 0.0
            start = i + 1
    if acc > 0:
        edges[-1] = lmax * (1 + 1e-12) + 1e-9
    edges = np.array(edges)
    nbins = len(edges) - 1
    ok = (ell >= edges[0]) & (ell < edges[-1])
    b_of = np.clip(np.searchsorted(edges, ell, side="right") - 1, 0, nbins - 1)
    bw = np.bincount(b_of[ok], weights=hw[ok], minlength=nbins)
    centres = np.bincount(b_of[ok], weights=(hw * ell)[ok], minlength=nbins) / bw
    P = np.zeros((nbins, nb, nb))
    for i in range(nb):
        for j in range(i, nb):
            c = (dec[i] * np.conj(dec[j])).real
            v = np.bincount(b_of[ok], weights=(hw * c)[ok], minlength=nbins) / bw * omega / npix / w2
            P[:, i, j] = P[:, j, i] = v
    livef = np.stack([np.bincount(b_of[ok], weights=(hw * live[i])[ok], minlength=nbins) / bw for i in range(nb)])
    f = np.minimum(livef[:, None, :], livef[None, :, :]).transpose(2, 0, 1)
    P = np.where(f > 0, P / np.where(f > 0, f, 1), 0)
    for i in range(nb):
        dead = P[:, i, i] == 0
        P[dead, i, :] = 0
        P[dead, :, i] = 0
        P[dead, i, i] = 1e100
    wgt = bw
    Ps = P.copy()
    for k in range(nbins):
        lo, hi = max(k - 1, 0), min(k + 1, nbins - 1)
        ws = [(kk, (2 if kk == k else 1) * wgt[kk]) for kk in range(lo, hi + 1)]
        Ps[k] = sum(w * P[kk] for kk, w in ws) / sum(w for _, w in ws)
    # diagonal loading until the correlation matrix has condition number <= 1e8 (as umbra)
    for k in range(nbins):
        d = np.sqrt(np.diag(Ps[k]))
        corr = Ps[k] / np.outer(d, d)
        eps = 0.0
        ev = np.linalg.eigvalsh(corr)
        while not (ev[0] > 0) or ev[-1] / ev[0] > 1e8:
            eps = 1e-10 if eps == 0 else eps * 10
            ev = np.linalg.eigvalsh(corr + eps * np.diag(np.diag(corr)))
        if eps > 0:
            Ps[k][np.diag_indices(nb)] *= 1 + eps
    # nodes and inverse noise
    step = fund / 8
    nn = int(lmax // step) + 2
    nodes = np.arange(nn) * step
    Pn = np.empty((nn, nb, nb))
    for i in range(nb):
        for j in range(nb):
            Pn[:, i, j] = np.interp(nodes, centres, Ps[:, i, j]) / omega
    Q = np.linalg.inv(Pn)
    x = ell / step
    idx = np.minimum(np.floor(x).astype(int), nn - 2)
    t = x - idx
    a = np.array(meta["sed"])
    # combined whitened spectrum D = a^T Q (M/B) and q = a^T Q a per mode
    Qa = np.einsum("nij,j->ni", Q, a)
    D = np.zeros(ell.shape, dtype=complex)
    for j in range(nb):
        qj = Qa[idx, j] * (1 - t) + Qa[idx + 1, j] * t
        D += qj * dec[j]
    qn = np.einsum("ni,i->n", Qa, a)
    q = qn[idx] * (1 - t) + qn[idx + 1] * t
    KX = np.arange(kx.size)
    # numpy's own frequency order (fftfreq: the Nyquist row is -n/2), as umbra's layout and fit use it
    KY = np.rint(np.fft.fftfreq(n) * n).astype(int)
    y0 = []
    for c in meta["clusters"]:
        th = c["theta500Arcmin"] * np.pi / (180 * 60)
        if not np.isfinite(c["px"]) or not np.isfinite(th):
            y0.append(None)
            continue
        u = ell * th / du
        i0 = np.floor(u).astype(int)
        inside = i0 < g.size - 1
        i0c = np.where(inside, i0, 0)
        tau = np.where(inside, g[i0c] * (1 - (u - i0)) + g[np.minimum(i0c + 1, g.size - 1)] * (u - i0), 0) * th * th
        ph = np.outer(np.exp(2j * np.pi * KY * c["py"] / n), np.exp(2j * np.pi * KX * c["px"] / n))
        b = np.sum(hw * tau * (D * ph).real) / (npix * omega)
        phi = np.sum(hw * tau * tau * q) / (npix * omega * omega)
        y0.append(float(b / phi))
    secs = time.perf_counter() - t0
    print(json.dumps({"seconds": secs, "y0": y0, "numpy": np.__version__}))


if __name__ == "__main__":
    main(sys.argv[1])
