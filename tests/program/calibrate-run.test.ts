/**
 * Renders the starter program for a recipe, runs it on simulated bundles (tests/program/simulate.py)
 * and compares what it solved with the simulation's truth. Numeric comparisons are computed by
 * check_run.py; the limits, and where they come from, are here.
 */
import { createHash } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createSimRecipe, REPO_ROOT, runPython, SIM_FIELDS, simulateBundle, writeProgram } from './program-helpers';

// each test runs python3 on simulated data: allow for a busy 2-core machine
vi.setConfig({ testTimeout: 60_000 });

type CalStats = {
	chi2_ratio: number;
	n_samples: number;
	cluster_max_dist_sigma: number;
	cluster_frac_within_4sigma: number;
	cluster_n: number;
	dead_flagged: boolean;
	rfi_zero_flagged: boolean;
};
type Check = {
	reference_antenna: string;
	delay_max_err_ns: number;
	delay_n_missing_live: number;
	delay_dead_is_null: boolean;
	delay_sigma_bl_ns: number;
	bandpass_amp_max_err: number;
	bandpass_phase_max_err_deg: number;
	bandpass_unflagged_fraction_live: number;
	bandpass_rfi_flagged: boolean;
	bandpass_dead_flagged: boolean;
	bootstrap_jy: number;
	bootstrap_err_jy: number;
	bootstrap_true_jy: number;
	flux_cal: CalStats;
	gain_cal: CalStats;
	target: { true_flux: number[]; fits: { flux: number[]; imag: number[]; sigma: number[] }[]; chi2_ratio: number };
};
type Step = { kind: string; fields: string[]; duration_s: number; n_solutions: number; n_failed: number };
type Report = {
	format: string;
	format_version: number;
	recipe: { id: string; version: number; script_sha256: string };
	bundle: { n_row: number; n_chan: number; n_corr: number; n_ant: number; sha256: string };
	reference_antenna: string;
	reference_fallbacks: { step: string; time_s: number; from: string; to: string }[];
	steps: Step[];
	delay: { delay_ns: (number | null)[][] };
	bandpass: { amplitude: (number | null)[][][]; flag: boolean[][][]; chan_freq_hz: number[] };
	gain: { time_s: number[]; field: string[]; amplitude: (number | null)[][][] };
	flux: { field: string; derived_jy: number | null; error_jy: number | null; ref_freq_hz: number }[];
	checks: { code: string; field: string; status: string; value: number | null; threshold: number | null }[];
	diagnostics: Record<string, { amp: number[]; phase_deg: number[]; uvdist_m: number[] }>;
};

const CHECKER = join(REPO_ROOT, 'tests', 'program', 'check_run.py');
// Simulation set-up (the simulator's inputs, not check values): 8 antennas, 64 channels over
// 500 MHz, noise 0.1 Jy per real part per channel and integration, flux-calibrator scan of 20
// integrations then gain/target/gain/target/gain scans of 10; antenna 6 (A06) dead; A01 flagged
// in scan 4 (the second gain-calibrator scan); channels 10 and 11 hit by interference.
const N_ANT = 8;
const N_CORR = 2;
const SCHEDULE = 'flux:20,gain,target,gain,target,gain';
const SIM_ARGS = ['--n-ant', '8', '--n-chan', '64', '--sigma', '0.1', '--schedule', SCHEDULE, '--dead-antenna', '5', '--rfi', '10,11'];
const OUTAGE_SCAN = 4;
const OUTAGE_INTEGRATIONS = 10;
const GAIN_INTERVALS = 20 + 3 * 10; // integration intervals on the flux and gain calibrators
const EXCLUDED = 2; // recipe excludes channels 30-31
const RFI = 2;

let dir = '';
let program = '';
let check: Check;
let report: Report;
let runStdout = '';
let inputSha = '';
let checkNoRipple: Check;

function sha256File(path: string): string {
	return createHash('sha256').update(readFileSync(path)).digest('hex');
}

function runAndCheck(bundle: string, truth: string, out: string): { check: Check; stdout: string } {
	const run = runPython([program, 'run', bundle, '--out', out]);
	if (run.status !== 0) throw new Error(`program run failed (${String(run.status)}):\n${run.stderr}`);
	const checked = runPython([CHECKER, truth, out]);
	if (checked.status !== 0) throw new Error(`check_run.py failed:\n${checked.stderr}`);
	return { check: JSON.parse(checked.stdout) as Check, stdout: run.stdout };
}

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'phasewright-program-'));
	program = writeProgram(dir, createSimRecipe());
	const bundle = join(dir, 'sim.npz');
	simulateBundle(bundle, join(dir, 'truth.json'), [...SIM_ARGS, '--ref-outage-scan', String(OUTAGE_SCAN)]);
	inputSha = sha256File(bundle);
	const main = runAndCheck(bundle, join(dir, 'truth.json'), join(dir, 'out'));
	check = main.check;
	runStdout = main.stdout;
	report = JSON.parse(readFileSync(join(dir, 'out', 'report.json'), 'utf8')) as Report;
	// a second bundle without bandpass phase ripple, where the delay truth is unambiguous
	const flat = join(dir, 'flat.npz');
	simulateBundle(flat, join(dir, 'flat.json'), [...SIM_ARGS, '--seed', '5', '--phase-ripple-deg', '0']);
	checkNoRipple = runAndCheck(flat, join(dir, 'flat.json'), join(dir, 'out-flat')).check;
}, 120_000);

afterAll(() => {
	if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('delay step', () => {
	it('recovers antenna delays relative to the reference within the noise', () => {
		// METHODS.md §2 (derived there, Monte Carlo-checked): one baseline's LS delay has
		// sigma_tau = sqrt(12) sigma_phi / (2 pi |dnu| sqrt(Nc (Nc^2 - 1))), sigma_phi = 1/SNR_ch.
		// check_run.py evaluates it for the weakest baseline (lowest simulated gain amplitudes);
		// the antenna LS combines N-1 baselines, so 5 sigma of the weakest baseline is conservative.
		expect(checkNoRipple.delay_n_missing_live).toBe(0);
		expect(checkNoRipple.delay_max_err_ns).toBeLessThan(5 * checkNoRipple.delay_sigma_bl_ns);
	});

	it('absorbs a bandpass phase ripple only up to its least-squares slope', () => {
		// A phase ripple bounded by a over a band B has an LS slope of at most 3a/B rad/Hz
		// (slope = sum x phi / sum x^2 <= a (B^2/4) / (B^3/12)); that part of it is a delay,
		// i.e. at most 3a / (2 pi B). Here a = 4 degrees (largest simulated ripple), B = 500 MHz.
		const a = (4 * Math.PI) / 180;
		const bound = (3 * a) / (2 * Math.PI * 500e6) * 1e9;
		expect(check.delay_max_err_ns).toBeLessThan(bound + 5 * check.delay_sigma_bl_ns);
		expect(check.delay_dead_is_null).toBe(true);
	});
});

describe('bandpass step', () => {
	it('matches the simulated bandpass within 1 % in amplitude and 1 degree in phase', () => {
		// Noise bound (METHODS.md §3, high-SNR factors for N = 7 live antennas): sigma|B|/|B| =
		// sqrt((2N-3)/(2(N-1)(N-2)))/SNR_bl = 0.43/SNR_bl, sigma(phase) = sqrt(2/N)/SNR_bl = 0.53/SNR_bl rad.
		// The weakest channel (band edge, roll-off 0.615 per antenna, gains >= 0.8, S(1 GHz) = 17.7 Jy,
		// noise 0.1/sqrt(20)) has SNR_bl >= 17.7 * 0.38 * 0.64 / 0.0224 = 192: 0.22 % and 0.16 degrees,
		// so 1 % and 1 degree are more than 4 sigma everywhere. Constant phase per antenna is
		// removed first (it belongs to G), as is the amplitude normalisation (METHODS.md §4.5).
		expect(check.bandpass_amp_max_err).toBeLessThan(0.01);
		expect(check.bandpass_phase_max_err_deg).toBeLessThan(1);
		expect(check.bandpass_rfi_flagged).toBe(true);
		expect(check.bandpass_dead_flagged).toBe(true);
	});

	it('normalises each antenna and hand to mean amplitude 1 over unflagged channels', () => {
		// METHODS.md §4.5 normalisation rule
		for (const ant of report.bandpass.amplitude) {
			for (let c = 0; c < N_CORR; c++) {
				const values = ant.map((ch) => ch[c]).filter((v): v is number => v !== null);
				if (values.length === 0) continue;
				const mean = values.reduce((s, v) => s + v, 0) / values.length;
				expect(mean).toBeCloseTo(1, 9);
			}
		}
	});
});

describe('flux bootstrap', () => {
	it('derives the gain calibrator flux density within 2 % of the simulated 2.345 Jy', () => {
		// 2 %: twice the ~1 % internal bootstrap accuracy (VLA status summary, via METHODS.md §7)
		expect(check.bootstrap_true_jy).toBe(2.345);
		expect(Math.abs(check.bootstrap_jy / check.bootstrap_true_jy - 1)).toBeLessThan(0.02);
		expect(check.bootstrap_err_jy).toBeGreaterThan(0);
		expect(check.bootstrap_err_jy).toBeLessThan(0.01 * check.bootstrap_jy);
	});
});

describe('corrected calibrators', () => {
	it('leave residuals at the thermal level (METHODS.md §12)', () => {
		// chi2_ratio = mean |V_corr - S|^2 / mean(2 sigma_corr^2), sigma_corr = sigma / |g_p g_q B_p B_q| from
		// the truth. Over > 30 000 samples its own scatter is ~1/sqrt(N) < 0.6 %. Upwards, per-integration
		// gain errors (METHODS.md §3: ~0.43 and 0.53 / SNR_bl, SNR_bl >= 70 here) add up to ~5 % of the
		// noise variance; downwards, self-calibration absorbs a fraction (2N-1)/(2 n_bl) of the noise of
		// the data it solves on, ~2 % per sample for the flux calibrator (B and G both fitted on it).
		for (const stats of [check.flux_cal, check.gain_cal]) {
			expect(stats.n_samples).toBeGreaterThan(30000);
			expect(stats.chi2_ratio).toBeGreaterThan(0.95);
			expect(stats.chi2_ratio).toBeLessThan(1.08);
			expect(stats.dead_flagged).toBe(true);
			expect(stats.rfi_zero_flagged).toBe(true);
		}
	});

	it('form one tight cluster at (1, 0) in the complex plane', () => {
		// Per-integration, per-baseline averages of r = V/S: |r - 1| / sigma is Rayleigh distributed when
		// only noise remains, P(> k) = exp(-k^2/2): 3e-4 beyond 4, and 1140 * exp(-15.1) = 3e-4 for any
		// of ~1140 points beyond 5.5. A second cluster (bad antenna, wrong sign) would sit far outside.
		for (const stats of [check.flux_cal, check.gain_cal]) {
			expect(stats.cluster_n).toBeGreaterThan(500);
			expect(stats.cluster_frac_within_4sigma).toBeGreaterThan(0.99);
			expect(stats.cluster_max_dist_sigma).toBeLessThan(5.5);
		}
	});

	it('pass the program’s own verification checks', () => {
		const fields = new Set(report.checks.map((c) => c.field));
		expect(fields).toEqual(new Set([SIM_FIELDS.flux, SIM_FIELDS.gain]));
		for (const c of report.checks) expect(c.status, `${c.field} ${c.code}`).toBe('pass');
		expect(report.checks.map((c) => c.code)).toEqual(expect.arrayContaining(['amplitude_scatter', 'phase_rms', 'flux_ratio', 'uv_amplitude_slope']));
	});
});

describe('target', () => {
	it('equals the known point-source model within the noise', () => {
		// Linear LS fit of the three simulated sources' flux densities (known positions) to the
		// corrected target data; sigma from the fit covariance. Allowed: 4 sigma plus 2 % of S for the
		// flux scale (the bootstrap tolerance above) in the real part, and the same in the imaginary
		// part (2 % of S is a 1.1 degree phase error, the size of interpolation errors between scans).
		const t = check.target;
		for (const fit of t.fits) {
			t.true_flux.forEach((s, i) => {
				const sigma = fit.sigma[i] ?? Infinity;
				expect(Math.abs((fit.flux[i] ?? NaN) - s)).toBeLessThan(4 * sigma + 0.02 * s);
				expect(Math.abs(fit.imag[i] ?? NaN)).toBeLessThan(4 * sigma + 0.02 * s);
			});
		}
		// residuals at the thermal level (same statistic as for the calibrators)
		expect(t.chi2_ratio).toBeGreaterThan(0.97);
		expect(t.chi2_ratio).toBeLessThan(1.05);
	});
});

describe('reference antenna and flags', () => {
	it('falls back to the next reference while the primary is flagged, and reports it', () => {
		const gainFallbacks = report.reference_fallbacks.filter((f) => f.step === 'gain');
		// one per integration interval of the outage scan (simulation set-up)
		expect(gainFallbacks).toHaveLength(OUTAGE_INTEGRATIONS);
		for (const f of gainFallbacks) {
			expect(f.from).toBe('A01');
			expect(f.to).toBe('A03');
		}
		expect(runStdout).toContain('reference fallback in gain');
		expect(report.reference_antenna).toBe('A01');
	});

	it('counts flagged solutions per step from the dead antenna, the outage and interference', () => {
		const step = (kind: string): Step => {
			const found = report.steps.find((s) => s.kind === kind);
			if (!found) throw new Error(`step ${kind} missing from the report`);
			return found;
		};
		expect(report.steps.map((s) => s.kind)).toEqual(['delay', 'bandpass_prep', 'bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify']);
		// delay: the dead antenna, both hands
		expect(step('delay').n_failed).toBe(N_CORR);
		// bandpass: the dead antenna on every usable channel, plus the interference channels of the others
		expect(step('bandpass').n_failed).toBe(N_CORR * (64 - EXCLUDED) + N_CORR * RFI * (N_ANT - 1));
		// gain: the dead antenna in every interval, plus A01 during its outage
		expect(step('gain').n_solutions).toBe(GAIN_INTERVALS * N_ANT * N_CORR);
		expect(step('gain').n_failed).toBe(N_CORR * GAIN_INTERVALS + N_CORR * OUTAGE_INTEGRATIONS);
		for (const s of report.steps) expect(s.duration_s).toBeGreaterThanOrEqual(0);
	});
});

describe('outputs', () => {
	it('writes a run report in the agreed format', () => {
		expect(report.format).toBe('phasewright.run-report');
		expect(report.format_version).toBe(1);
		expect(report.bundle).toMatchObject({ n_chan: 64, n_corr: 2, n_ant: 8, sha256: inputSha });
		expect(report.recipe.script_sha256).toBe(sha256File(program));
		expect(report.delay.delay_ns).toHaveLength(N_ANT);
		expect(report.gain.time_s).toHaveLength(GAIN_INTERVALS);
		expect(report.flux[0]).toMatchObject({ field: SIM_FIELDS.gain });
		for (const [, d] of Object.entries(report.diagnostics)) {
			expect(d.amp.length).toBeLessThanOrEqual(5000);
			expect(d.amp.length).toBe(d.phase_deg.length);
			expect(d.amp.length).toBe(d.uvdist_m.length);
		}
		expect(Object.keys(report.diagnostics)).toContain(SIM_FIELDS.target);
	});

	it('leaves the input untouched and writes a calibrated bundle with its provenance', () => {
		expect(sha256File(join(dir, 'sim.npz'))).toBe(inputSha);
		const script = [
			'import json, sys, numpy as np',
			'a = np.load(sys.argv[1], allow_pickle=False)',
			'rec = json.loads(str(a["calibration_recipe"]))',
			'print(json.dumps({"sha": str(a["calibration_script_sha256"]), "title": rec["title"], "format": str(a["format"]),',
			' "vis": str(a["vis"].dtype), "rows": int(a["vis"].shape[0]), "zero_flagged": bool(np.all(a["vis"][a["flag"]] == 0)),',
			' "excluded": bool(a["flag"][:, 30:32].all()), "weight": bool(np.all(a["weight"] >= 0))}))'
		].join('\n');
		const run = runPython(['-c', script, join(dir, 'out', 'calibrated.npz')]);
		expect(run.stderr).toBe('');
		const out = JSON.parse(run.stdout) as Record<string, unknown>;
		expect(out).toMatchObject({ sha: sha256File(program), format: 'phasewright.visibility-bundle', vis: 'complex64', zero_flagged: true, excluded: true, weight: true });
		expect(out.title).toBe(createSimRecipe().title);
		const sols = runPython(['-c', 'import sys, numpy as np; a = np.load(sys.argv[1]); print(sorted(a.files))', join(dir, 'out', 'solutions.npz')]);
		for (const key of ['delay_ns', 'delay_ref_freq_hz', 'bandpass', 'bandpass_flag', 'gain', 'gain_flag', 'gain_time', 'gain_field', 'reference_antenna', 'antenna_name', 'corr_type']) {
			expect(sols.stdout).toContain(`'${key}'`);
		}
	});
});

describe('plan and summarize commands', () => {
	it('plan prints every step without data', () => {
		const run = runPython([program, 'plan']);
		expect(run.status).toBe(0);
		for (const kind of ['delay', 'bandpass_prep', 'bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify']) expect(run.stdout).toContain(`. ${kind}:`);
		expect(run.stdout).toContain('A01');
	});

	it('summarize prints an observation summary of the bundle', () => {
		const run = runPython([program, 'summarize', join(dir, 'sim.npz')]);
		expect(run.status).toBe(0);
		const s = JSON.parse(run.stdout) as {
			format: string;
			format_version: number;
			array: { antennas: { name: string }[] };
			spectral_windows: { n_chan: number; first_freq_hz: number; chan_width_hz: number }[];
			fields: { name: string; ra_deg: number; dec_deg: number; intents?: string[] }[];
			scans: { id: number; field_id: number; start_utc: string; end_utc: string }[];
			flagged_antennas: string[];
		};
		expect(s.format).toBe('phasewright.observation');
		expect(s.format_version).toBe(1);
		expect(s.array.antennas).toHaveLength(N_ANT);
		// simulator inputs: 1.0 GHz start, 500 MHz over 64 channels
		expect(s.spectral_windows[0]).toMatchObject({ n_chan: 64, first_freq_hz: 1e9, chan_width_hz: 500e6 / 64 });
		expect(s.fields.map((f) => f.name)).toEqual([SIM_FIELDS.flux, SIM_FIELDS.gain, SIM_FIELDS.target]);
		expect(s.fields[0]?.intents).toEqual(['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator']);
		// simulator input position of 3C286 in degrees
		expect(s.fields[0]?.ra_deg).toBeCloseTo(202.784534, 6);
		expect(s.scans).toHaveLength(6);
		// first scan: 20 integrations of 8 s from the epoch
		expect(s.scans[0]).toMatchObject({ id: 1, field_id: 0, start_utc: '2026-03-14T20:00:00Z', end_utc: '2026-03-14T20:02:40Z' });
		expect(s.flagged_antennas).toEqual(['A06']);
	});
});

describe('row order', () => {
	it('gives the same calibration when the bundle rows are shuffled', () => {
		// DESIGN.md: "readers must not rely on any order". Same simulation, rows permuted.
		const shuffled = join(dir, 'shuffled.npz');
		simulateBundle(shuffled, join(dir, 'shuffled.json'), [...SIM_ARGS, '--ref-outage-scan', String(OUTAGE_SCAN), '--shuffle-rows']);
		const run = runPython([program, 'run', shuffled, '--out', join(dir, 'out-shuffled')]);
		expect(run.status, run.stderr).toBe(0);
		const script = [
			'import json, sys, numpy as np',
			'def load(p):',
			'    a = np.load(p + "/calibrated.npz")',
			'    order = np.lexsort((a["ant2"], a["ant1"], a["time"]))',
			'    return a["vis"][order], a["flag"][order], a["weight"][order]',
			'v1, f1, w1 = load(sys.argv[1]); v2, f2, w2 = load(sys.argv[2])',
			'r1 = json.load(open(sys.argv[1] + "/report.json")); r2 = json.load(open(sys.argv[2] + "/report.json"))',
			'scale = np.abs(v1).max()',
			'print(json.dumps({"flags_equal": bool(np.array_equal(f1, f2)), "max_vis_diff": float(np.abs(v1 - v2).max() / scale),',
			' "max_weight_diff": float(np.abs(w1 - w2).max() / np.abs(w1).max()),',
			' "flux": [r1["flux"][0]["derived_jy"], r2["flux"][0]["derived_jy"]]}))'
		].join('\n');
		const cmp = runPython(['-c', script, join(dir, 'out'), join(dir, 'out-shuffled')]);
		expect(cmp.stderr).toBe('');
		const res = JSON.parse(cmp.stdout) as { flags_equal: boolean; max_vis_diff: number; max_weight_diff: number; flux: number[] };
		expect(res.flags_equal).toBe(true);
		// sums taken in another order differ by rounding only (float32 data, float64 sums)
		expect(res.max_vis_diff).toBeLessThan(1e-4);
		expect(res.max_weight_diff).toBeLessThan(1e-4);
		expect(Math.abs((res.flux[0] ?? NaN) / (res.flux[1] ?? NaN) - 1)).toBeLessThan(1e-6);
	});
});
