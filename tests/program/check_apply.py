#!/usr/bin/env python3
"""Recomputes the correction of one field from solutions.npz, independently of the program.

  python3 check_apply.py BUNDLE OUT_DIR FIELD GAIN_FIELD MODE

For unflagged samples of FIELD, raw / corrected must equal K_p B_p G_p conj(K_q B_q G_q) with
K_p = exp(-2 pi i (nu - nu_ref) tau_p) (METHODS.md 1), B from solutions.npz and G from the
GAIN_FIELD solutions at the row's time: linear in amplitude and unwrapped phase between the
bracketing solutions, the nearest held outside (METHODS.md 6), or the nearest solution (MODE
'nearest'). Prints the largest relative difference and the number of samples compared.
"""
import json
import sys

import numpy as np

bundle_path, out_dir, field, gain_field, mode = sys.argv[1:6]
raw = np.load(bundle_path)
cal = np.load(out_dir + "/calibrated.npz")
sol = np.load(out_dir + "/solutions.npz")
fid_raw = [str(f) for f in raw["field_name"]].index(field)
fid_cal = [str(f) for f in cal["field_name"]].index(field)
rows_raw = np.flatnonzero(raw["field"] == fid_raw)
rows_cal = np.flatnonzero(cal["field"] == fid_cal)
key_raw = np.stack([raw["time"][rows_raw], raw["ant1"][rows_raw], raw["ant2"][rows_raw]], axis=1)
key_cal = np.stack([cal["time"][rows_cal], cal["ant1"][rows_cal], cal["ant2"][rows_cal]], axis=1)
rows_raw = rows_raw[np.lexsort(key_raw.T[::-1])]
rows_cal = rows_cal[np.lexsort(key_cal.T[::-1])]
freq = raw["chan_freq"]
nu_ref = 0.5 * (freq[0] + freq[-1])
delay = np.nan_to_num(sol["delay_ns"]) * 1e-9
k = np.exp(-2j * np.pi * (freq - nu_ref)[None, :, None] * delay[:, None, :])
spec = k * sol["bandpass"]
gmask = np.array([str(f) == gain_field for f in sol["gain_field"]])
gt = sol["gain_time"][gmask]
gg = sol["gain"][gmask]
gf = sol["gain_flag"][gmask]
order = np.argsort(gt)
gt, gg, gf = gt[order], gg[order], gf[order]
times = raw["time"][rows_raw]
n_ant, n_par = gg.shape[1], gg.shape[2]
gains = np.zeros((len(times), n_ant, n_par), dtype=complex)
for a in range(n_ant):
    for c in range(n_par):
        ok = ~gf[:, a, c]
        if not ok.any():
            continue
        ts, gs = gt[ok], gg[ok, a, c].astype(complex)
        if mode == "nearest":
            idx = np.abs(times[:, None] - ts[None, :]).argmin(axis=1)
            gains[:, a, c] = gs[idx]
        else:
            amp = np.interp(times, ts, np.abs(gs))
            ph = np.interp(times, ts, np.unwrap(np.angle(gs)))
            gains[:, a, c] = amp * np.exp(1j * ph)
a1 = raw["ant1"][rows_raw]
a2 = raw["ant2"][rows_raw]
rt = np.arange(len(rows_raw))
expected = spec[a1] * np.conj(spec[a2]) * (gains[rt, a1] * np.conj(gains[rt, a2]))[:, None, :]
v_raw = raw["vis"][rows_raw]
v_cal = cal["vis"][rows_cal]
ok = ~cal["flag"][rows_cal] & (np.abs(expected) > 0)
ratio = v_raw[ok] / v_cal[ok]
diff = np.abs(ratio - expected[ok]) / np.abs(expected[ok])
print(json.dumps({"max_rel_diff": float(diff.max()), "n": int(ok.sum()), "n_total": int(ok.size)}))
