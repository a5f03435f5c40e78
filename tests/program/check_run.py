#!/usr/bin/env python3
"""Compares a program run (report.json, calibrated.npz) with the simulator's truth.

  python3 check_run.py TRUTH.json OUT_DIR

Prints one JSON object of measured errors and the noise levels they are judged against;
the Vitest test holds the assertions (and their derivations). numpy only.
"""
import json
import math
import os
import sys

import numpy as np

# Perley & Butler 2017 3C286 coefficients, via METHODS.md 8 (GHz)
PB2017_3C286 = (1.2481, -0.4507, -0.1798, 0.0357)
C = 299792458.0


def flux_3c286(freq_hz):
    x = np.log10(np.asarray(freq_hz) / 1e9)
    return 10.0 ** sum(a * x ** i for i, a in enumerate(PB2017_3C286))


def main(truth_path, out_dir):
    truth = json.load(open(truth_path))
    report = json.load(open(os.path.join(out_dir, "report.json")))
    names = truth["antenna_names"]
    n_ant = len(names)
    freq = np.array(truth["chan_freq_hz"])
    n_chan = len(freq)
    sigma = truth["sigma_jy"]
    ref_name = report["reference_antenna"]
    ref = names.index(ref_name)
    dead = truth["dead_antenna"]
    live = np.array([n != dead for n in names])
    out = {"reference_antenna": ref_name}

    # delays relative to the reference antenna
    d_true = np.array(truth["delay_ns"])
    d_true = d_true - d_true[ref][None, :]
    d_prog = np.array([[np.nan if v is None else v for v in row] for row in report["delay"]["delay_ns"]])
    err = np.abs(d_prog - d_true)[live]
    out["delay_max_err_ns"] = float(np.nanmax(err))
    out["delay_n_missing_live"] = int(np.isnan(err).sum())
    out["delay_dead_is_null"] = bool(dead is None or all(v is None for v in report["delay"]["delay_ns"][names.index(dead)]))
    # METHODS.md 2 precision of one baseline's delay: sigma_tau = sqrt(12) sigma_phi / (2 pi |dnu| sqrt(Nc (Nc^2 - 1)))
    # with sigma_phi = 1 / SNR_ch; the weakest baseline: lowest gain amplitudes, the flux calibrator at band centre,
    # averaged over the integrations of the delay scan
    amp0 = np.array(truth["gain_amp0"])[live]
    n_int = [s["n_int"] for s in truth["scans"] if s["role"] == "flux"][0]
    s_mid = float(flux_3c286(truth["ref_freq_hz"]))
    snr_ch = s_mid * amp0.min() ** 2 * math.sqrt(n_int) / sigma
    out["delay_sigma_bl_ns"] = 1e9 * math.sqrt(12) / snr_ch / (2 * math.pi * truth["chan_width_hz"] * math.sqrt(n_chan * (n_chan ** 2 - 1)))

    # bandpass: amplitude normalised like the program (mean 1 over its unflagged channels),
    # phase referenced to the reference antenna, a constant per antenna and hand removed
    bp = report["bandpass"]
    amp_p = np.array([[[np.nan if v is None else v for v in ch] for ch in a] for a in bp["amplitude"]])
    ph_p = np.radians(np.array([[[np.nan if v is None else v for v in ch] for ch in a] for a in bp["phase_deg"]]))
    flag = np.array(bp["flag"], dtype=bool)
    amp_t = np.array(truth["bandpass_amp"])
    ph_t = np.array(truth["bandpass_phase_rad"])
    ph_t = ph_t - ph_t[ref][None, :, :]
    amp_t_norm = np.where(flag, np.nan, amp_t)
    amp_t_norm = amp_t_norm / np.nanmean(amp_t_norm, axis=1, keepdims=True)
    amp_err = np.abs(amp_p / amp_t_norm - 1.0)[live]
    dphi = np.angle(np.exp(1j * (ph_p - ph_t)))
    const = np.angle(np.nanmean(np.exp(1j * dphi), axis=1, keepdims=True))
    dphi = np.degrees(np.abs(np.angle(np.exp(1j * (dphi - const)))))[live]
    out["bandpass_amp_max_err"] = float(np.nanmax(amp_err))
    out["bandpass_phase_max_err_deg"] = float(np.nanmax(dphi))
    out["bandpass_unflagged_fraction_live"] = float((~flag[live]).mean())
    rfi = truth["rfi_channels"]
    out["bandpass_rfi_flagged"] = bool(all(flag[:, c, :].all() for c in rfi))
    out["bandpass_dead_flagged"] = bool(dead is None or flag[names.index(dead)].all())

    # flux bootstrap
    gain_name = truth["fields"]["gain"]
    entry = [f for f in report["flux"] if f["field"] == gain_name][0]
    out["bootstrap_jy"] = entry["derived_jy"]
    out["bootstrap_err_jy"] = entry["error_jy"]
    out["bootstrap_true_jy"] = truth["gain_flux_jy"]

    # corrected data
    cal = np.load(os.path.join(out_dir, "calibrated.npz"), allow_pickle=False)
    vis = cal["vis"]
    flagc = cal["flag"]
    fields = [str(f) for f in cal["field_name"]]
    a1, a2 = cal["ant1"], cal["ant2"]
    x = (np.arange(n_chan) + 0.5) / n_chan
    central = (x > 0.15) & (x < 0.85)

    def expected_var(rows):
        """Thermal variance of one corrected complex sample per real part: sigma / |g_p g_q B_p B_q| (truth)."""
        g = np.array(truth["gain_amp0"])
        # the program's bandpass normalisation moves the scale into G; the product is what corrects the data
        scale = (g[a1[rows]] * g[a2[rows]])[:, None, :] * (amp_t[a1[rows]] * amp_t[a2[rows]])
        return (sigma / scale) ** 2

    def cal_stats(role, model_of):
        fid = fields.index(truth["fields"][role])
        rows = np.flatnonzero(cal["field"] == fid)
        v = vis[rows][:, central]
        ok = ~flagc[rows][:, central]
        m = model_of(rows)[:, central]
        var = expected_var(rows)[:, central]
        res = np.abs(v - m) ** 2
        ratio = float(res[ok].mean() / (2.0 * var[ok]).mean())
        r = v / m
        # per-row averages over the central channels: the cluster in the complex plane
        cnt = ok.sum(axis=1)
        keep = cnt.min(axis=1) > 0
        ravg = (np.where(ok, r, 0).sum(axis=1)[keep] / cnt[keep])
        sig_avg = np.sqrt((np.where(ok, var / np.abs(m) ** 2, 0).sum(axis=1)[keep]) / cnt[keep] ** 2)
        dist = np.abs(ravg - 1.0) / sig_avg
        return {
            "chi2_ratio": ratio,
            "n_samples": int(ok.sum()),
            "cluster_max_dist_sigma": float(dist.max()),
            "cluster_frac_within_4sigma": float((dist < 4.0).mean()),
            "cluster_n": int(dist.size),
            "thermal_avg_pct": float(100 * np.sqrt(np.mean(sig_avg ** 2) / 2)),
            "dead_flagged": bool(dead is None or flagc[rows][(a1[rows] == names.index(dead)) | (a2[rows] == names.index(dead))].all()),
            "rfi_zero_flagged": bool(all(flagc[rows][:, c].all() and not np.any(vis[rows][:, c]) for c in rfi)),
        }

    out["flux_cal"] = cal_stats("flux", lambda rows: np.broadcast_to(flux_3c286(freq)[None, :, None], (len(rows), n_chan, 2)))
    out["gain_cal"] = cal_stats("gain", lambda rows: np.full((len(rows), n_chan, 2), truth["gain_flux_jy"]))

    # target: known point sources; fit their flux densities by linear least squares
    fid = fields.index(truth["fields"]["target"])
    rows = np.flatnonzero(cal["field"] == fid)
    uvw = cal["uvw"][rows]
    basis = []
    for src in truth["target_sources"]:
        l, m = src["l"], src["m"]
        n = math.sqrt(1 - l * l - m * m)
        path = (uvw[:, 0] * l + uvw[:, 1] * m + uvw[:, 2] * (n - 1))[:, None] * freq[None, :] / C
        basis.append(np.exp(-2j * np.pi * path)[:, central])
    model = sum(src["flux_jy"] * b for src, b in zip(truth["target_sources"], basis))
    v = vis[rows][:, central]
    ok = ~flagc[rows][:, central]
    var = expected_var(rows)[:, central]
    fits = []
    for c in range(2):
        okc = ok[:, :, c]
        w = 1.0 / var[:, :, c][okc]
        a = np.stack([b[okc] for b in basis], axis=1)
        y = v[:, :, c][okc]
        sw = np.sqrt(w)
        coef, *_ = np.linalg.lstsq(a * sw[:, None], y * sw, rcond=None)
        cov = np.linalg.inv((a.conj().T * w) @ a)
        fits.append({"flux": [complex(z).real for z in coef], "imag": [complex(z).imag for z in coef], "sigma": np.sqrt(np.real(np.diag(cov))).tolist()})
    res = np.abs(v - model[:, :, None]) ** 2
    out["target"] = {
        "true_flux": [s["flux_jy"] for s in truth["target_sources"]],
        "fits": fits,
        "chi2_ratio": float(res[ok].mean() / (2.0 * var[ok]).mean()),
    }
    print(json.dumps(out))


if __name__ == "__main__":
    main(sys.argv[1], sys.argv[2])
