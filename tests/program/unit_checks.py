#!/usr/bin/env python3
"""Drives the rendered program's solver functions on small problems and prints the results as JSON.

  python3 unit_checks.py PROGRAM.py

The program is imported as a module (its command line only runs under __main__). The
expected values live in the Vitest test beside this file, with their sources; this script
computes only what the program returns and independent reference answers (numpy lstsq).
"""
import importlib.util
import json
import math
import sys

import numpy as np


def load_program(path):
    spec = importlib.util.spec_from_file_location("rendered_program", path)
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def vis_matrix(g, model):
    """R[p, q] = g_p conj(g_q) M (METHODS.md 1), zero diagonal."""
    r = g[:, None] * np.conj(g[None, :]) * model
    np.fill_diagonal(r, 0)
    return r


def gauss_newton_reference(r, w, g0, iters=60):
    """Independent solver: Gauss-Newton on the real-valued problem with numpy lstsq.

    Unknowns: Re g (all) and Im g (all but antenna 0, whose phase is fixed to 0).
    Residuals: Re/Im of R_pq - g_p conj(g_q) for p < q, weighted by sqrt(w).
    """
    n = len(g0)
    p_idx, q_idx = np.triu_indices(n, 1)
    sw = np.sqrt(w[p_idx, q_idx])
    g = g0.astype(np.complex128).copy()
    g = g * np.conj(g[0]) / abs(g[0])
    for _ in range(iters):
        model = g[p_idx] * np.conj(g[q_idx])
        res = (r[p_idx, q_idx] - model) * sw
        # d(model)/d Re g_k and d/d Im g_k
        cols = []
        for k in range(n):
            d_re = np.where(p_idx == k, np.conj(g[q_idx]), 0) + np.where(q_idx == k, g[p_idx], 0)
            cols.append(d_re * sw)
        for k in range(1, n):
            d_im = np.where(p_idx == k, 1j * np.conj(g[q_idx]), 0) + np.where(q_idx == k, -1j * g[p_idx], 0)
            cols.append(d_im * sw)
        jac = np.stack(cols, axis=1)
        a = np.concatenate([jac.real, jac.imag])
        b = np.concatenate([res.real, res.imag])
        step, *_ = np.linalg.lstsq(a, b, rcond=None)
        g = g + step[:n] + 1j * np.concatenate([[0.0], step[n:]])
        if np.linalg.norm(step) < 1e-14:
            break
    return g


def gauss_newton_phase(r, w, phi0, iters=60):
    """Independent phase-only solver: Gauss-Newton on phi_1..phi_{n-1} (phi_0 = 0) with numpy lstsq."""
    n = len(phi0)
    p_idx, q_idx = np.triu_indices(n, 1)
    sw = np.sqrt(w[p_idx, q_idx])
    phi = phi0 - phi0[0]
    for _ in range(iters):
        g = np.exp(1j * phi)
        model = g[p_idx] * np.conj(g[q_idx])
        res = (r[p_idx, q_idx] - model) * sw
        cols = [(np.where(p_idx == k, 1j * model, 0) + np.where(q_idx == k, -1j * model, 0)) * sw for k in range(1, n)]
        jac = np.stack(cols, axis=1)
        step, *_ = np.linalg.lstsq(np.concatenate([jac.real, jac.imag]), np.concatenate([res.real, res.imag]), rcond=None)
        phi = phi + np.concatenate([[0.0], step])
        if np.linalg.norm(step) < 1e-14:
            break
    return np.exp(1j * phi)


def check_stefcal(prog):
    out = {}
    # METHODS.md 3 noise-free check: P = 8, |g| = 1.0..1.7, phases (0, 30, -45, 60, 90, -120, 150, -170) deg, M = 2.5
    amp = np.arange(8) * 0.1 + 1.0
    phase = np.radians([0, 30, -45, 60, 90, -120, 150, -170])
    g_true = amp * np.exp(1j * phase)
    model = 2.5
    r = vis_matrix(g_true, model) / model  # R-bar with the model divided out (M-bar = 1)
    w = np.ones((8, 8)) * model ** 2
    np.fill_diagonal(w, 0)
    g, conv, iters = prog.solve_stefcal(r[None], w[None], tol=1e-10, max_iter=200)
    g = g[0] * np.conj(g[0][0]) / abs(g[0][0])
    out["noise_free_max_err"] = float(np.max(np.abs(g - g_true)))
    out["noise_free_iterations"] = int(iters)
    out["noise_free_converged"] = bool(conv[0])
    # random small problems with noise vs the Gauss-Newton reference
    rng = np.random.default_rng(7)
    diffs = []
    phase_only_diffs = []
    for trial in range(12):
        n = int(rng.integers(4, 12))
        gt = (1 + 0.2 * rng.standard_normal(n)) * np.exp(1j * rng.uniform(-np.pi, np.pi, n))
        rr = vis_matrix(gt, 1.0)
        noise = 0.05 * (rng.standard_normal((n, n)) + 1j * rng.standard_normal((n, n)))
        noise = np.triu(noise, 1)
        noise = noise + np.conj(noise.T)
        rr = rr + noise
        ww = rng.uniform(0.5, 2.0, (n, n))
        ww = np.triu(ww, 1)
        ww = ww + ww.T
        gs, conv, _ = prog.solve_stefcal(rr[None], ww[None], tol=1e-12, max_iter=500)
        gs = gs[0] * np.conj(gs[0][0]) / abs(gs[0][0])
        ref = gauss_newton_reference(rr, ww, gs * np.exp(0.01j))
        diffs.append(float(np.max(np.abs(gs - ref))))
        # phase-only: compare with Gauss-Newton over the phases alone
        gp, _, _ = prog.solve_stefcal(rr[None], ww[None], phase_only=True, tol=1e-12, max_iter=500)
        gp = gp[0] * np.conj(gp[0][0])
        refp = gauss_newton_phase(rr, ww, np.angle(gp) + 0.01)
        phase_only_diffs.append(float(np.max(np.abs(gp - refp))))
    out["random_max_diff_vs_lstsq"] = max(diffs)
    out["phase_only_max_diff_vs_lstsq"] = max(phase_only_diffs)
    # SNR formula: equal gains 1, SNR_bl = 1 / sigma, reduces to SNR_bl sqrt(N - 1) (METHODS.md 3)
    n = 27
    sigma = 0.1
    snrs = []
    rng = np.random.default_rng(11)
    for _ in range(20):
        rr = vis_matrix(np.ones(n, dtype=complex), 1.0)
        noise = sigma * (rng.standard_normal((n, n)) + 1j * rng.standard_normal((n, n)))
        noise = np.triu(noise, 1)
        rr = rr + noise + np.conj(noise.T)
        ww = np.ones((n, n)) / sigma ** 2
        np.fill_diagonal(ww, 0)
        gs, conv, _ = prog.solve_stefcal(rr[None], ww[None])
        snr, nbl = prog.solution_quality(gs, rr[None], ww[None])
        snrs.append(float(np.median(snr)))
    out["snr_median_p27"] = float(np.median(snrs))
    out["snr_expected_p27"] = (1.0 / sigma) * math.sqrt(n - 1)
    # batched solve equals one-by-one solves
    batch_r = np.stack([vis_matrix(g_true * np.exp(1j * k), 1.0) for k in range(3)])
    batch_w = np.broadcast_to(w, batch_r.shape).copy()
    gb, conv, _ = prog.solve_stefcal(batch_r, batch_w, tol=1e-10, max_iter=200)
    gb = gb * np.conj(gb[:, :1]) / np.abs(gb[:, :1])
    out["batched_max_err"] = float(np.max(np.abs(gb - g_true[None])))
    return out


def check_delay(prog):
    # METHODS.md 2 check table: N_c = 64, dnu = 1 MHz, nu_0 = 1.000 GHz, nu_ref = mean frequency, noise-free
    freq = 1.0e9 + 1.0e6 * np.arange(64)
    ref = freq.mean()
    taus_ns = [3.2, -7.5, 12.25, 150.0, -499.0]
    y = np.stack([np.exp(-2j * np.pi * (freq - ref) * t * 1e-9) for t in taus_ns])
    res = prog.solve_baseline_delays(y, np.ones_like(y.real), freq, ref)
    out = {
        "true_ns": taus_ns,
        "fft_ns": (res["fft"] * 1e9).tolist(),
        "parabolic_ns": (res["parabolic"] * 1e9).tolist(),
        "ls_ns": (res["ls"] * 1e9).tolist(),
    }
    # LS over all 10 baselines of 5 antennas with tau = (0, 3.2, -7.5, 12.25, 150) ns
    tau_ant = np.array([0.0, 3.2, -7.5, 12.25, 150.0]) * 1e-9
    a1, a2 = np.triu_indices(5, 1)
    tau_bl = tau_ant[a1] - tau_ant[a2]
    y = np.stack([np.exp(-2j * np.pi * (freq - ref) * t) for t in tau_bl])
    res = prog.solve_baseline_delays(y, np.ones_like(y.real), freq, ref)
    tau, _ = prog.solve_antenna_delays(res["ls"], np.ones(len(a1)), a1, a2, 5, 0)
    out["antenna_true_ns"] = (tau_ant * 1e9).tolist()
    out["antenna_ns"] = (tau * 1e9).tolist()
    # search window: a 150 ns delay searched within +/- 50 ns cannot be found there
    res = prog.solve_baseline_delays(np.exp(-2j * np.pi * (freq - ref) * 150e-9)[None], np.ones((1, 64)), freq, ref, 50e-9)
    out["windowed_150_snr"] = float(res["snr"][0])
    res = prog.solve_baseline_delays(np.exp(-2j * np.pi * (freq - ref) * 12.25e-9)[None], np.ones((1, 64)), freq, ref, 50e-9)
    out["windowed_12_ns"] = float(res["ls"][0] * 1e9)
    out["windowed_12_snr"] = float(res["snr"][0])
    # Monte Carlo precision: N_c = 64, dnu = 1 MHz, SNR_ch = 5 (METHODS.md 2 derived value 0.215 ns)
    rng = np.random.default_rng(3)
    n = 4000
    true = rng.uniform(-20, 20, n) * 1e-9
    clean = np.exp(-2j * np.pi * (freq - ref)[None, :] * true[:, None])
    sigma_phi = 1.0 / 5.0
    # phase noise sigma_phi = sigma / A at high SNR, with sigma the rms of the real part (METHODS.md 9)
    noisy = clean + sigma_phi * (rng.standard_normal(clean.shape) + 1j * rng.standard_normal(clean.shape))
    res = prog.solve_baseline_delays(noisy, np.ones((n, 64)), freq, ref)
    out["mc_rms_ns"] = float(np.sqrt(np.mean((res["ls"] - true) ** 2)) * 1e9)
    return out


def check_interpolation(prog):
    # METHODS.md 6 check: t = (0, 100, 200) s, |g| = (1.0, 1.2, 1.1), phi = (170, -170, -150) deg
    t = np.array([0.0, 100.0, 200.0])
    g = np.array([1.0, 1.2, 1.1]) * np.exp(1j * np.radians([170.0, -170.0, -150.0]))
    out_t = np.array([-50.0, 50.0, 150.0, 250.0])
    gi, jumps = prog.interpolate_gains(t, g[:, None], np.zeros((3, 1), dtype=bool), out_t, "linear")
    gn, _ = prog.interpolate_gains(t, g[:, None], np.zeros((3, 1), dtype=bool), out_t, "nearest")
    flagged = np.array([[False], [True], [False]])
    gf, _ = prog.interpolate_gains(t, g[:, None], flagged, np.array([100.0]), "linear")
    return {
        "times": out_t.tolist(),
        "amp": np.abs(gi[:, 0]).tolist(),
        "phase_deg": np.degrees(np.angle(gi[:, 0])).tolist(),
        "nearest_amp": np.abs(gn[:, 0]).tolist(),
        "jumps": jumps,
        "skip_flagged_amp": float(np.abs(gf[0, 0])),
    }


def check_bootstrap(prog):
    # METHODS.md 7 check: |g^f| = (1.00, 0.95, 1.10, 1.05, 0.90), S_true = 2.345,
    # |g^s| = |g^f| sqrt(2.345) (1, 1.01, 0.99, 1.005, 0.995)
    gf = np.array([1.00, 0.95, 1.10, 1.05, 0.90])
    gs = gf * math.sqrt(2.345) * np.array([1, 1.01, 0.99, 1.005, 0.995])
    s, err, n = prog.bootstrap_flux(gs, gf)
    s_drop, _, n_drop = prog.bootstrap_flux(np.append(gs, np.nan), np.append(gf, 1.0))
    return {"flux": s, "error": err, "n": n, "rescale": math.sqrt(1.0 / s), "n_with_dropped": n_drop, "flux_with_dropped": s_drop}


def check_flux_model(prog):
    # Perley & Butler 2017 3C286 coefficients as the program receives them (log_polynomial, GHz)
    model = {"kind": "log_polynomial", "coefficients": [1.2481, -0.4507, -0.1798, 0.0357], "freq_unit_hz": 1e9}
    manual = {"kind": "power_law", "flux_jy": 2.0, "ref_freq_hz": 1.4e9, "spectral_index": -0.7, "curvature": 0.0}
    return {
        "pb2017_3c286": prog.evaluate_flux_model(model, np.array([1.0e9, 1.4e9, 3.0e9])).tolist(),
        "power_law_2p8ghz": float(prog.evaluate_flux_model(manual, np.array([2.8e9]))[0]),
    }


def main(path):
    prog = load_program(path)
    print(json.dumps({
        "stefcal": check_stefcal(prog),
        "delay": check_delay(prog),
        "interpolation": check_interpolation(prog),
        "bootstrap": check_bootstrap(prog),
        "flux_model": check_flux_model(prog),
        "parameters": {"title": prog.TITLE, "notes": prog.NOTES, "fields": list(prog.FIELD_ROLES), "targets": prog.TARGETS},
    }))


if __name__ == "__main__":
    main(sys.argv[1])
