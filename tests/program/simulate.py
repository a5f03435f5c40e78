#!/usr/bin/env python3
"""Simulated Phasewright visibility bundles (format v1) for the program tests, benchmark and demo.

Invented data: an invented array, an invented gain calibrator and target; the flux calibrator
follows the published 3C286 standard (Perley & Butler 2017 coefficients, via METHODS.md 8).
numpy only, seeded: the same options give the same bundle.

  python3 simulate.py bundle --out B.npz --truth T.json [--preset demo|bench] [options]
  python3 simulate.py observation --summary S.json --out B.npz [--truth T.json] [--antennas A,B,..]
                      [--scans all|shortest|ID,..] [--max-integrations-per-scan K] [options]
  python3 simulate.py bad --from B.npz --kind KIND --out BAD.npz

The observation command lays the bundle out like a phasewright.observation v1 summary (antenna
names and positions, the window's channels, fields, scan numbers and times, integration time,
correlations) and writes it compressed; it is how the demo observation's simulated bundle is made.
Antennas left out of --antennas keep their names and positions but get no rows.

Corruption model (METHODS.md 1): vis = g_p conj(g_q) M + noise, g_p = G_p(t) B_p(nu) K_p(nu),
K_p = exp(-2 pi i (nu - nu_ref) tau_p), nu_ref the window centre.
"""
import argparse
import json
import math
import os
import sys

import numpy as np

C = 299792458.0
SIDEREAL_RATE = 2.0 * math.pi / 86164.0905  # rad/s (common practice)
# Perley & Butler 2017 (ApJS 230, 7) 3C286, log S[Jy] = sum a_i (log nu_GHz)^i, via METHODS.md 8
PB2017_3C286 = (1.2481, -0.4507, -0.1798, 0.0357)
FIELD_NAMES = {"flux": "3C286", "gain": "Nursery G1", "target": "Nursery T1 'north\"", "gain2": "Nursery G2"}
FIELD_INTENTS = {
    "flux": "flux_calibrator,bandpass_calibrator,delay_calibrator",
    "gain": "gain_calibrator",
    "target": "target",
    "gain2": "gain_calibrator",
}
# hostile field names (quotes, newlines, NUL, line separators, a lone surrogate, bidi controls,
# template and format syntax) for the end-to-end test that user text stays data. Recipes refuse
# lone surrogates, so only bundle-only names (the array's, the last antenna's) carry one.
HOSTILE_FIELD_NAMES = {
    "flux": 'flux"""\n__import__("os").system("echo pwned")\n#',
    "gain": "gain '''\\ \u2028\u2029\r\x00 {{py x}}",
    "target": "target \u202e\u2066 {0} %s \U0001F600 \" '",
    "gain2": "gain2 {{{p.title}}}",
}
# positions: 3C286 (from memory, METHODS.md 10); the others are invented
FIELD_RADEC_DEG = {"flux": (202.784534, 30.509155), "gain": (198.0, 27.5), "target": (200.5, 28.2), "gain2": (204.0, 31.0)}
# invented target: point sources (l, m in radians, flux density in Jy)
TARGET_SOURCES = [(0.0, 0.0, 0.6), (3.0e-4, -2.0e-4, 0.35), (-4.0e-4, 1.5e-4, 0.25)]


# size presets: the program tests use the defaults (8 antennas, 64 channels); "demo" is a small
# bundle for the demo scenario's invented 28-dish array (1.0-1.5 GHz); "bench" is bench:program's
PRESETS = {
    "demo": {"n_ant": 28, "n_chan": 256, "schedule": "flux:15,gain:5,target:20,gain:5,target:20,gain:5", "sigma": 0.3, "dead_antenna": 11, "rfi": "40,41,42", "extent": 4000.0},
    "bench": {"n_ant": 40, "n_chan": 1024, "schedule": "flux:20,gain:10,target:50,gain:10,target:50,gain:10,target:40,gain:10", "sigma": 0.3, "dead_antenna": 7, "rfi": "102,103", "truth_bandpass": False},
}


def flux_3c286(freq_hz):
    x = np.log10(np.asarray(freq_hz) / 1e9)
    return 10.0 ** sum(a * x ** i for i, a in enumerate(PB2017_3C286))


def enu_to_uvw(enu, latitude, hour_angle, dec):
    """Baseline east-north-up (metres) -> (u, v, w) towards (hour angle, dec) (TMS ch. 4 form, from memory)."""
    e, n, u = enu[..., 0], enu[..., 1], enu[..., 2]
    x = -math.sin(latitude) * n + math.cos(latitude) * u
    y = e
    z = math.cos(latitude) * n + math.sin(latitude) * u
    sh, ch = np.sin(hour_angle), np.cos(hour_angle)
    sd, cd = math.sin(dec), math.cos(dec)
    uu = sh * x + ch * y
    vv = -sd * ch * x + sd * sh * y + cd * z
    ww = cd * ch * x - cd * sh * y + sd * z
    return np.stack([uu, vv, ww], axis=-1)


def parse_schedule(text, default_n_int):
    scans = []
    for item in text.split(","):
        role, _, count = item.strip().partition(":")
        if role not in FIELD_NAMES:
            raise SystemExit("unknown schedule entry %r (use flux, gain, gain2, target)" % role)
        scans.append((role, int(count) if count else default_n_int))
    return scans


def draw_antenna_terms(rng, n_ant, n_corr, freq, ref_freq, opts):
    """Delays, bandpasses and time-variable gains per antenna and hand (draws from rng in a fixed order)."""
    n_chan = len(freq)
    delay_ns = rng.uniform(-opts.delay_max_ns, opts.delay_max_ns, (n_ant, 1)) + rng.uniform(-0.3, 0.3, (n_ant, n_corr))
    x = (np.arange(n_chan) + 0.5) / n_chan
    roll = 1.0 / np.sqrt(1.0 + ((x - 0.5) / 0.48) ** 20)
    k_amp = rng.integers(2, 5, (n_ant, n_corr))
    k_ph = rng.integers(1, 4, (n_ant, n_corr))
    a_amp = rng.uniform(0.01, 0.04, (n_ant, n_corr))
    a_ph = np.radians(rng.uniform(0.25, 1.0, (n_ant, n_corr)) * opts.phase_ripple_deg)
    off_ph = np.radians(rng.uniform(-40, 40, (n_ant, n_corr)))
    # ripples symmetric about the band centre, so they carry no linear phase (the delay stays the truth)
    bp_amp = roll[None, :, None] * (1.0 + a_amp[:, None, :] * np.cos(2 * np.pi * k_amp[:, None, :] * (x[None, :, None] - 0.5)))
    bp_phase = off_ph[:, None, :] + a_ph[:, None, :] * np.cos(2 * np.pi * k_ph[:, None, :] * (x[None, :, None] - 0.5))
    bandpass = bp_amp * np.exp(1j * bp_phase)
    kterm = np.exp(-2j * np.pi * (freq - ref_freq)[None, :, None] * delay_ns[:, None, :] * 1e-9)
    spectral = (bandpass * kterm).astype(np.complex64)
    g_amp0 = rng.uniform(0.8, 1.2, (n_ant, n_corr))
    g_ph0 = rng.uniform(-np.pi, np.pi, (n_ant, n_corr))
    g_rate = np.radians(rng.uniform(-20, 20, (n_ant, n_corr))) / 3600.0
    g_psi = rng.uniform(0, 2 * np.pi, (n_ant, n_corr))
    g_chi = rng.uniform(0, 2 * np.pi, (n_ant, n_corr))

    def gains_at(t):
        t = np.asarray(t)[:, None, None]
        amp = g_amp0 * (1.0 + opts.amp_drift * np.sin(2 * np.pi * t / 10800.0 + g_psi))
        ph = g_ph0 + g_rate * t + np.radians(6.0) * np.sin(2 * np.pi * t / 7200.0 + g_chi)
        return amp * np.exp(1j * ph)

    return {"spectral": spectral, "delay_ns": delay_ns, "bp_amp": bp_amp, "bp_phase": bp_phase, "g_amp0": g_amp0, "gains_at": gains_at}


def model_spectra(kinds, field_of_rows, uvw, freq):
    """Sky model per row and channel: kinds[f] is ("standard",) for 3C286, ("point", S) or ("sources",)."""
    model = np.zeros((len(field_of_rows), len(freq)), dtype=np.complex64)
    for f, kind in enumerate(kinds):
        sel = field_of_rows == f
        if not sel.any():
            continue
        if kind[0] == "standard":
            model[sel] = flux_3c286(freq)[None, :]
        elif kind[0] == "point":
            model[sel] = kind[1]
        else:
            u = uvw[sel]
            acc = np.zeros((int(sel.sum()), len(freq)), dtype=np.complex128)
            for l, m, sjy in TARGET_SOURCES:
                n = math.sqrt(1.0 - l * l - m * m)
                path = (u[:, 0] * l + u[:, 1] * m + u[:, 2] * (n - 1.0))[:, None] * freq[None, :] / C
                acc += sjy * np.exp(-2j * np.pi * path)
            model[sel] = acc
    return model


def corrupt(rng, ant1, ant2, row_tindex, row_field, uvw, gtime, spectral, freq, kinds, sigma):
    """vis = g_p conj(g_q) M + noise, in chunks (noise drawn chunk by chunk, in row order)."""
    n_row, n_chan, n_corr = len(ant1), len(freq), spectral.shape[2]
    vis = np.empty((n_row, n_chan, n_corr), dtype=np.complex64)
    chunk = max(1, (1 << 22) // (n_chan * n_corr))
    for s in range(0, n_row, chunk):
        sl = slice(s, min(s + chunk, n_row))
        r1, r2 = ant1[sl], ant2[sl]
        ti = row_tindex[sl]
        gprod = gtime[ti, r1] * np.conj(gtime[ti, r2])  # (m, n_corr)
        prod = spectral[r1] * np.conj(spectral[r2]) * gprod[:, None, :].astype(np.complex64)
        model = model_spectra(kinds, row_field[sl], uvw[sl], freq)
        noise = rng.standard_normal((len(r1), n_chan, n_corr, 2), dtype=np.float32) * np.float32(sigma)
        vis[sl] = prod * model[:, :, None] + (noise[..., 0] + 1j * noise[..., 1])
    return vis


def simulate(opts):
    rng = np.random.default_rng(opts.seed)
    field_names = HOSTILE_FIELD_NAMES if opts.hostile_names else FIELD_NAMES
    n_ant, n_chan, n_corr = opts.n_ant, opts.n_chan, 2
    width = opts.bandwidth / n_chan
    freq = opts.first_freq + width * np.arange(n_chan)
    ref_freq = 0.5 * (freq[0] + freq[-1])
    names = ["A%02d" % (i + 1) for i in range(n_ant)]
    if opts.hostile_names:
        names[-1] = names[-1] + " \ud800\n\u202e"
    pos = np.stack([rng.uniform(-opts.extent, opts.extent, n_ant), rng.uniform(-opts.extent, opts.extent, n_ant), rng.uniform(-3, 3, n_ant)], axis=1)
    latitude = math.radians(-30.7)
    schedule = parse_schedule(opts.schedule, opts.n_int)
    roles = []
    for role, _ in schedule:
        if role not in roles:
            roles.append(role)
    field_index = {role: i for i, role in enumerate(roles)}
    terms = draw_antenna_terms(rng, n_ant, n_corr, freq, ref_freq, opts)
    spectral, delay_ns, bp_amp, bp_phase, g_amp0 = (terms[k] for k in ("spectral", "delay_ns", "bp_amp", "bp_phase", "g_amp0"))

    # rows: time-major, every baseline
    a1, a2 = np.triu_indices(n_ant, k=1)
    n_bl = len(a1)
    times, scan_ids, field_ids = [], [], []
    t = 0.0
    for k, (role, count) in enumerate(schedule):
        for i in range(count):
            times.append(t + (i + 0.5) * opts.integration)
            scan_ids.append(k + 1)
            field_ids.append(field_index[role])
        t += count * opts.integration + opts.gap
    times = np.array(times)
    n_time = len(times)
    n_row = n_time * n_bl
    row_time = np.repeat(times, n_bl)
    row_scan = np.repeat(np.array(scan_ids, dtype=np.int32), n_bl)
    row_field = np.repeat(np.array(field_ids, dtype=np.int32), n_bl)
    ant1 = np.tile(a1, n_time).astype(np.int32)
    ant2 = np.tile(a2, n_time).astype(np.int32)
    ra = np.radians([FIELD_RADEC_DEG[r][0] for r in roles])
    dec = np.radians([FIELD_RADEC_DEG[r][1] for r in roles])
    lst0 = ra[0]
    hour_angle = lst0 + SIDEREAL_RATE * row_time - ra[row_field]
    uvw = np.zeros((n_row, 3))
    for f in range(len(roles)):
        sel = row_field == f
        uvw[sel] = enu_to_uvw(pos[ant2[sel]] - pos[ant1[sel]], latitude, hour_angle[sel], dec[f])
    gtime = terms["gains_at"](times)  # (n_time, n_ant, n_corr)
    flag = np.zeros((n_row, n_chan, n_corr), dtype=bool)
    dead = opts.dead_antenna
    outage_scan = opts.ref_outage_scan
    rfi = [int(c) for c in opts.rfi.split(",") if c.strip()] if opts.rfi else []
    sigma = opts.sigma
    kinds = [{"flux": ("standard",), "gain": ("point", opts.gain_flux), "gain2": ("point", opts.gain2_flux)}.get(r, ("sources",)) for r in roles]
    vis = corrupt(rng, ant1, ant2, np.repeat(np.arange(n_time), n_bl), row_field, uvw, gtime, spectral, freq, kinds, sigma)
    if dead >= 0:
        bad = (ant1 == dead) | (ant2 == dead)
        vis[bad] = 1.0e3
        flag[bad] = True
    if outage_scan > 0:
        bad = (row_scan == outage_scan) & ((ant1 == 0) | (ant2 == 0))
        vis[bad] = 7.0e2
        flag[bad] = True
    for c in rfi:
        vis[:, c, :] = 50.0 + 50.0j
        flag[:, c, :] = True
    weight = np.full((n_row, n_corr), 1.0 / sigma ** 2, dtype=np.float32)
    if opts.shuffle_rows:
        # same data in a random row order (readers must not rely on any order)
        perm = np.random.default_rng(opts.seed + 1000).permutation(n_row)
        vis, flag, weight, row_time, row_scan, row_field, ant1, ant2, uvw = (
            a[perm] for a in (vis, flag, weight, row_time, row_scan, row_field, ant1, ant2, uvw)
        )
    arrays = {
        "format": np.array("phasewright.visibility-bundle"),
        "format_version": np.array(1, dtype=np.int16),
        "vis": vis,
        "flag": flag,
        "weight": weight,
        "time": row_time,
        "time_epoch_utc": np.array("2026-03-14T20:00:00Z"),
        "integration_s": np.array(float(opts.integration)),
        "ant1": ant1,
        "ant2": ant2,
        "scan": row_scan,
        "field": row_field,
        "uvw": uvw,
        "chan_freq": freq,
        "corr_type": np.array(["XX", "YY"]),
        "antenna_name": np.array(names),
        "antenna_position": pos,
        "antenna_diameter": np.full(n_ant, 13.5),
        "field_name": np.array([field_names[r] for r in roles]),
        "field_ra": ra,
        "field_dec": dec,
        "array_name": np.array("Corrie Flats Array (simulated)" + (" \ud800\u2028" if opts.hostile_names else "")),
        "array_latitude": np.array(latitude),
        "field_intents": np.array([FIELD_INTENTS[r] for r in roles]),
    }
    truth = {
        "antenna_names": names,
        "corr": ["XX", "YY"],
        "delay_ns": delay_ns.tolist(),
        "ref_freq_hz": ref_freq,
        "chan_freq_hz": freq.tolist(),
        "chan_width_hz": width,
        "bandwidth_hz": opts.bandwidth,
        "bandpass_amp": bp_amp.tolist() if opts.truth_bandpass else None,
        "bandpass_phase_rad": bp_phase.tolist() if opts.truth_bandpass else None,
        "sigma_jy": sigma,
        "phase_ripple_max_deg": opts.phase_ripple_deg,
        "gain_flux_jy": opts.gain_flux,
        "gain2_flux_jy": opts.gain2_flux,
        "amp_drift": opts.amp_drift,
        "gain_amp0": g_amp0.tolist(),
        "target_sources": [{"l": l, "m": m, "flux_jy": s} for l, m, s in TARGET_SOURCES],
        "fields": {r: field_names[r] for r in roles},
        "dead_antenna": names[dead] if dead >= 0 else None,
        "ref_outage_scan": outage_scan if outage_scan > 0 else None,
        "rfi_channels": rfi,
        "scans": [{"scan": k + 1, "role": role, "field": field_names[role], "n_int": n} for k, (role, n) in enumerate(schedule)],
        "n_ant": n_ant,
        "n_chan": n_chan,
        "n_row": n_row,
    }
    return arrays, truth


CALIBRATOR_INTENTS = ("bandpass_calibrator", "delay_calibrator", "gain_calibrator")
DEFAULT_LATITUDE_DEG = -30.7  # invented, as in simulate()


class SummaryError(Exception):
    """A summary the simulator cannot use; the message says what and where."""


def parse_utc(text, where):
    import datetime

    try:
        value = datetime.datetime.fromisoformat(str(text).replace("Z", "+00:00"))
    except ValueError:
        raise SummaryError("%s: %r is not an ISO 8601 time such as 2026-03-14T20:00:00Z" % (where, text))
    if value.tzinfo is None:
        raise SummaryError("%s: %r has no time zone; write it in UTC with a trailing Z" % (where, text))
    return value.timestamp()


def read_summary(path):
    """Reads a phasewright.observation v1 summary (JSON)."""
    try:
        with open(path, encoding="utf-8") as handle:
            summary = json.load(handle)
    except OSError as exc:
        raise SummaryError("%s: cannot read the summary (%s)" % (path, exc.strerror or exc))
    except ValueError as exc:
        raise SummaryError("%s is not valid JSON (%s)" % (path, exc))
    if not isinstance(summary, dict) or summary.get("format") != "phasewright.observation":
        raise SummaryError("%s: not a Phasewright observation summary (format must be 'phasewright.observation')" % path)
    if summary.get("format_version") != 1:
        raise SummaryError("%s: format_version %r is not supported; the simulator reads version 1" % (path, summary.get("format_version")))
    for key in ("array", "integration_s", "correlations", "spectral_windows", "fields", "scans"):
        if key not in summary:
            raise SummaryError("%s: key '%s' is missing" % (path, key))
    return summary


def select_scans(summary, choice, field_index):
    """Scans to simulate, in time order: 'all', 'shortest' or a comma list of scan ids.

    'shortest' is the shortest opening run of scans that visits every field observed at all and
    does not end on a target, so each target has a calibrator scan after it (and, in a usual
    schedule, one before it).
    """
    scans = sorted(summary["scans"], key=lambda s: parse_utc(s["start_utc"], "scan %s start_utc" % s.get("id")))
    for s in scans:
        if s["field_id"] not in field_index:
            raise SummaryError("scan %s: field_id %r is not one of the summary's fields" % (s["id"], s["field_id"]))
    if choice == "all":
        return scans
    if choice == "shortest":
        wanted = {s["field_id"] for s in scans}
        seen, chosen = set(), []
        for s in scans:
            chosen.append(s)
            seen.add(s["field_id"])
            if seen == wanted and field_index[s["field_id"]][1] != "target":
                return chosen
        return chosen
    ids = []
    for item in choice.split(","):
        try:
            ids.append(int(item))
        except ValueError:
            raise SummaryError("--scans: %r is not a scan id; give 'all', 'shortest' or a comma list such as 1,2,3" % item)
    by_id = {s["id"]: s for s in scans}
    missing = [i for i in ids if i not in by_id]
    if missing:
        raise SummaryError("--scans: scan id(s) %s are not in the summary (it has %s)" % (missing, sorted(by_id)))
    return [s for s in scans if s["id"] in set(ids)]


def simulate_observation(opts):
    """A bundle laid out like an observation summary: its antennas, window, fields, scans and times."""
    summary = read_summary(opts.summary)
    antennas = summary["array"]["antennas"]
    names = [str(a["name"]) for a in antennas]
    pos = np.array([[float(a["east_m"]), float(a["north_m"]), float(a.get("up_m", 0.0))] for a in antennas], dtype=np.float64)
    diameter = np.array([float(a.get("diameter_m", 13.5)) for a in antennas], dtype=np.float64)
    if opts.antennas:
        chosen_names = [n.strip() for n in opts.antennas.split(",") if n.strip()]
        unknown = [n for n in chosen_names if n not in names]
        if unknown:
            raise SummaryError("--antennas: %s not in the summary's array (it has %s)" % (", ".join(unknown), ", ".join(names)))
    else:
        chosen_names = list(names)
    with_data = sorted({names.index(n) for n in chosen_names})
    if len(with_data) < 3:
        raise SummaryError("--antennas: give at least 3 antennas (gains need 3 or more; METHODS.md 3)")
    windows = summary["spectral_windows"]
    spw = next((w for w in windows if w.get("id") == opts.spw_id), None)
    if spw is None:
        raise SummaryError("--spw-id %d: the summary has window id(s) %s" % (opts.spw_id, [w.get("id") for w in windows]))
    n_chan = int(spw["n_chan"])
    width = float(spw["chan_width_hz"])
    freq = float(spw["first_freq_hz"]) + width * np.arange(n_chan)
    ref_freq = 0.5 * (freq[0] + freq[-1])
    corr = [str(c) for c in summary["correlations"]]
    if corr != ["XX", "YY"] and corr != ["RR", "LL"]:
        raise SummaryError("correlations %s: the simulator writes two parallel hands, XX YY or RR LL" % corr)
    n_corr = 2
    integration = float(summary["integration_s"])
    fields = summary["fields"]
    field_index = {}
    kinds, intents_text = [], []
    try:
        point_fluxes = [float(x) for x in opts.calibrator_fluxes.split(",")]
    except ValueError:
        raise SummaryError("--calibrator-fluxes %r: give a comma list of flux densities in Jy, such as 2.345,1.234" % opts.calibrator_fluxes)
    n_point = 0
    for i, f in enumerate(fields):
        intents = list(f.get("intents") or [])
        if not intents:
            raise SummaryError("field %r has no intents; the simulator needs them to choose its sky model (add intents to the summary)" % f["name"])
        if "flux_calibrator" in intents:
            if str(f["name"]).replace(" ", "").upper() != "3C286":
                raise SummaryError("field %r is a flux calibrator, but the simulator models only 3C286 (Perley & Butler 2017)" % f["name"])
            kind = ("standard",)
        elif any(r in intents for r in CALIBRATOR_INTENTS):
            kind = ("point", point_fluxes[min(n_point, len(point_fluxes) - 1)])
            n_point += 1
        else:
            kind = ("sources",)
        kinds.append(kind)
        intents_text.append(",".join(intents))
        field_index[f["id"]] = (i, "target" if kind[0] == "sources" else "calibrator")
    scans = select_scans(summary, opts.scans, field_index)
    first = min(summary["scans"], key=lambda s: parse_utc(s["start_utc"], "scan %s start_utc" % s["id"]))
    epoch = parse_utc(first["start_utc"], "scan %s start_utc" % first["id"])
    times, scan_ids, field_ids = [], [], []
    for s in scans:
        start = parse_utc(s["start_utc"], "scan %s start_utc" % s["id"]) - epoch
        end = parse_utc(s["end_utc"], "scan %s end_utc" % s["id"]) - epoch
        count = max(1, int(math.floor((end - start) / integration + 1e-9)))
        if opts.max_integrations_per_scan > 0:
            count = min(count, opts.max_integrations_per_scan)
        for i in range(count):
            times.append(start + (i + 0.5) * integration)
            scan_ids.append(int(s["id"]))
            field_ids.append(field_index[s["field_id"]][0])
    if opts.sigma is not None:
        sigma = opts.sigma
    else:
        sefd = summary["array"].get("sefd_jy")
        if sefd is None:
            raise SummaryError("the summary gives no array.sefd_jy, so the noise cannot be derived; give --sigma (Jy)")
        eff = float(summary["array"].get("correlator_efficiency", 1.0))
        # radiometer equation, rms of the real part per channel and integration (Wrobel & Walker 1999, via METHODS.md 9)
        sigma = float(sefd) / (eff * math.sqrt(2.0 * abs(width) * integration))
    rng = np.random.default_rng(opts.seed)
    n_ant = len(names)
    terms = draw_antenna_terms(rng, n_ant, n_corr, freq, ref_freq, opts)
    live = np.array(with_data)
    i1, i2 = np.triu_indices(len(live), k=1)
    a1, a2 = live[i1], live[i2]
    n_bl = len(a1)
    times = np.array(times)
    n_time = len(times)
    row_tindex = np.repeat(np.arange(n_time), n_bl)
    row_time = times[row_tindex]
    row_scan = np.repeat(np.array(scan_ids, dtype=np.int32), n_bl)
    row_field = np.repeat(np.array(field_ids, dtype=np.int32), n_bl)
    ant1 = np.tile(a1, n_time).astype(np.int32)
    ant2 = np.tile(a2, n_time).astype(np.int32)
    ra = np.radians([float(f["ra_deg"]) for f in fields])
    dec = np.radians([float(f["dec_deg"]) for f in fields])
    latitude = math.radians(opts.latitude_deg)
    lst0 = ra[field_ids[0]]
    hour_angle = lst0 + SIDEREAL_RATE * row_time - ra[row_field]
    uvw = np.zeros((len(ant1), 3))
    for f in range(len(fields)):
        sel = row_field == f
        if sel.any():
            uvw[sel] = enu_to_uvw(pos[ant2[sel]] - pos[ant1[sel]], latitude, hour_angle[sel], dec[f])
    gtime = terms["gains_at"](times)
    vis = corrupt(rng, ant1, ant2, row_tindex, row_field, uvw, gtime, terms["spectral"], freq, kinds, sigma)
    flag = np.zeros(vis.shape, dtype=bool)
    flagged = [names.index(n) for n in summary.get("flagged_antennas") or [] if n in names]
    for a in flagged:
        bad = (ant1 == a) | (ant2 == a)
        vis[bad] = 1.0e3
        flag[bad] = True
    arrays = {
        "format": np.array("phasewright.visibility-bundle"),
        "format_version": np.array(1, dtype=np.int16),
        "vis": vis,
        "flag": flag,
        "weight": np.full((len(ant1), n_corr), 1.0 / sigma ** 2, dtype=np.float32),
        "time": row_time,
        "time_epoch_utc": np.array(str(first["start_utc"])),
        "integration_s": np.array(integration),
        "ant1": ant1,
        "ant2": ant2,
        "scan": row_scan,
        "field": row_field,
        "uvw": uvw,
        "chan_freq": freq,
        "corr_type": np.array(corr),
        "antenna_name": np.array(names),
        "antenna_position": pos,
        "antenna_diameter": diameter,
        "field_name": np.array([str(f["name"]) for f in fields]),
        "field_ra": ra,
        "field_dec": dec,
        "array_name": np.array("%s (simulated)" % summary["array"]["name"]),
        "array_latitude": np.array(latitude),
        "field_intents": np.array(intents_text),
    }
    truth = {
        "simulated_from": summary.get("name"),
        "antenna_names": names,
        "antennas_with_data": [names[i] for i in with_data],
        "flagged_antennas": [names[i] for i in flagged],
        "corr": corr,
        "delay_ns": terms["delay_ns"].tolist(),
        "ref_freq_hz": ref_freq,
        "chan_width_hz": width,
        "n_chan": n_chan,
        "sigma_jy": sigma,
        "amp_drift": opts.amp_drift,
        "amp_drift_period_s": 10800.0,
        "gain_amp0": terms["g_amp0"].tolist(),
        "fields": [{"name": str(f["name"]), "model": k[0], "flux_jy": k[1] if k[0] == "point" else None} for f, k in zip(fields, kinds)],
        "target_sources": [{"l": l, "m": m, "flux_jy": s} for l, m, s in TARGET_SOURCES],
        "scans": [{"scan": int(s["id"]), "field": str(fields[field_index[s["field_id"]][0]]["name"]), "n_int": scan_ids.count(int(s["id"])), "time_s": [float(t) for t, k in zip(times, scan_ids) if k == int(s["id"])]} for s in scans],
        "n_ant": n_ant,
        "n_row": len(ant1),
    }
    return arrays, truth


def write_bad(source, kind, out):
    """Deliberately broken bundles for the bad-input tests."""
    if kind == "truncated":
        with open(source, "rb") as handle:
            data = handle.read()
        with open(out, "wb") as handle:
            handle.write(data[: len(data) // 2])
        return
    if kind == "not_npz":
        with open(out, "w") as handle:
            handle.write("time,vis\n0,1\n")
        return
    with np.load(source, allow_pickle=False) as archive:
        arrays = {k: archive[k] for k in archive.files}
    if kind == "wrong_format":
        arrays["format"] = np.array("another.visibility-format")
    elif kind == "newer_version":
        arrays["format_version"] = np.array(2, dtype=np.int64)
    elif kind == "missing_key":
        del arrays["chan_freq"]
    elif kind == "wrong_dtype":
        arrays["vis"] = arrays["vis"].astype(np.complex128)
    elif kind == "bad_shape":
        arrays["flag"] = arrays["flag"][:-1]
    else:
        raise SystemExit("unknown bad kind %r" % kind)
    with open(out, "wb") as handle:
        np.savez(handle, **arrays)


def main():
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    sub = parser.add_subparsers(dest="command", required=True)
    b = sub.add_parser("bundle")
    b.add_argument("--out", required=True)
    b.add_argument("--truth", required=True)
    b.add_argument("--seed", type=int, default=1)
    b.add_argument("--n-ant", type=int, default=8)
    b.add_argument("--n-chan", type=int, default=64)
    b.add_argument("--n-int", type=int, default=10, help="integrations per scan when the schedule gives none")
    b.add_argument("--schedule", default="flux,gain,target,gain,target,gain", help="comma list of role[:integrations]")
    b.add_argument("--integration", type=float, default=8.0)
    b.add_argument("--gap", type=float, default=20.0, help="seconds between scans")
    b.add_argument("--first-freq", type=float, default=1.0e9)
    b.add_argument("--bandwidth", type=float, default=5.0e8)
    b.add_argument("--extent", type=float, default=1500.0, help="antenna east/north spread (metres)")
    b.add_argument("--sigma", type=float, default=0.5, help="noise rms of the real part per channel and integration (Jy)")
    b.add_argument("--gain-flux", type=float, default=2.345)
    b.add_argument("--gain2-flux", type=float, default=1.234)
    b.add_argument("--amp-drift", type=float, default=0.003, help="fractional slow gain amplitude drift")
    b.add_argument("--phase-ripple-deg", type=float, default=4.0, help="largest bandpass phase ripple amplitude")
    b.add_argument("--delay-max-ns", type=float, default=5.0)
    b.add_argument("--dead-antenna", type=int, default=-1, help="antenna index flagged throughout (-1: none)")
    b.add_argument("--ref-outage-scan", type=int, default=0, help="scan number in which A01 is flagged (0: none)")
    b.add_argument("--rfi", default="", help="comma list of channels hit by interference (flagged)")
    b.add_argument("--hostile-names", action="store_true", help="give the fields hostile names (see HOSTILE_FIELD_NAMES)")
    b.add_argument("--shuffle-rows", action="store_true", help="write the rows in a random order")
    b.add_argument("--no-truth-bandpass", dest="truth_bandpass", action="store_false")
    o = sub.add_parser("observation", help="a compressed bundle laid out like an observation summary (antennas, window, fields, scans)")
    o.add_argument("--summary", required=True, help="phasewright.observation v1 JSON")
    o.add_argument("--out", required=True)
    o.add_argument("--truth", help="write the simulation's truth (JSON) here")
    o.add_argument("--seed", type=int, default=1)
    o.add_argument("--antennas", default="", help="comma list of antenna names that get data (default: all); the rest keep their names and positions but have no rows")
    o.add_argument("--scans", default="all", help="'all', 'shortest' (every field, ending on a calibrator) or a comma list of scan ids")
    o.add_argument("--max-integrations-per-scan", type=int, default=0, help="keep at most this many integrations of each scan (0: all)")
    o.add_argument("--spw-id", type=int, default=0, help="spectral window to simulate")
    o.add_argument("--sigma", type=float, default=None, help="noise rms of the real part per channel and integration (Jy); default from the summary's SEFD")
    o.add_argument("--calibrator-fluxes", default="2.345,1.234", help="flux densities (Jy) of the point-source calibrators other than the flux calibrator, in field order")
    o.add_argument("--amp-drift", type=float, default=0.003, help="fractional slow gain amplitude drift")
    o.add_argument("--phase-ripple-deg", type=float, default=4.0, help="largest bandpass phase ripple amplitude")
    o.add_argument("--delay-max-ns", type=float, default=5.0)
    o.add_argument("--latitude-deg", type=float, default=DEFAULT_LATITUDE_DEG, help="array latitude (the summary has none)")
    bad = sub.add_parser("bad")
    bad.add_argument("--from", dest="source", required=True)
    bad.add_argument("--kind", required=True)
    bad.add_argument("--out", required=True)
    b.add_argument("--preset", choices=sorted(PRESETS), help="size preset; explicit options given on the command line win")
    opts = parser.parse_args()
    if opts.command == "bundle" and opts.preset:
        given = {a.split("=")[0] for a in sys.argv[2:] if a.startswith("--")}
        for key, value in PRESETS[opts.preset].items():
            if "--" + key.replace("_", "-") not in given:
                setattr(opts, key, value)
    if opts.command == "bad":
        write_bad(opts.source, opts.kind, opts.out)
        return 0
    if opts.command == "observation":
        try:
            arrays, truth = simulate_observation(opts)
        except SummaryError as exc:
            print("simulate.py observation: %s" % exc, file=sys.stderr)
            return 2
        except (KeyError, TypeError, ValueError) as exc:
            print("simulate.py observation: %s does not have the phasewright.observation v1 layout (%s: %s)" % (opts.summary, type(exc).__name__, exc), file=sys.stderr)
            return 2
        with open(opts.out, "wb") as handle:
            np.savez_compressed(handle, **arrays)
        if opts.truth:
            with open(opts.truth, "w") as handle:
                json.dump(truth, handle)
        return 0
    arrays, truth = simulate(opts)
    with open(opts.out, "wb") as handle:
        np.savez(handle, **arrays)
    with open(opts.truth, "w") as handle:
        json.dump(truth, handle)
    return 0


if __name__ == "__main__":
    sys.exit(main())
