/**
 * The rendered program's solver functions against published check values (METHODS.md, with the
 * original sources named beside each value) and against independent numpy least-squares solvers.
 * unit_checks.py imports the rendered program as a module and prints what its functions return.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createSimRecipe, REPO_ROOT, runPython, writeProgram } from './program-helpers';

// each test runs python3 on simulated data: allow for a busy 2-core machine
vi.setConfig({ testTimeout: 60_000 });

type UnitResults = {
	stefcal: {
		noise_free_max_err: number;
		noise_free_iterations: number;
		noise_free_converged: boolean;
		random_max_diff_vs_lstsq: number;
		phase_only_max_diff_vs_lstsq: number;
		snr_median_p27: number;
		snr_expected_p27: number;
		batched_max_err: number;
	};
	delay: {
		true_ns: number[];
		fft_ns: number[];
		parabolic_ns: number[];
		ls_ns: number[];
		antenna_true_ns: number[];
		antenna_ns: number[];
		windowed_150_snr: number;
		windowed_12_ns: number;
		windowed_12_snr: number;
		mc_rms_ns: number;
	};
	interpolation: { times: number[]; amp: number[]; phase_deg: number[]; nearest_amp: number[]; jumps: number; skip_flagged_amp: number };
	bootstrap: { flux: number; error: number; n: number; rescale: number; n_with_dropped: number; flux_with_dropped: number };
	flux_model: { pb2017_3c286: number[]; power_law_2p8ghz: number };
	parameters: { title: string; notes: string; fields: string[]; targets: { field: string }[] };
};

let dir = '';
let r: UnitResults;

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'phasewright-solvers-'));
	const program = writeProgram(dir, createSimRecipe());
	const run = runPython([join(REPO_ROOT, 'tests', 'program', 'unit_checks.py'), program]);
	if (run.status !== 0) throw new Error(`unit_checks.py failed:\n${run.stderr}`);
	r = JSON.parse(run.stdout) as UnitResults;
}, 60_000);

afterAll(() => {
	if (dir) rmSync(dir, { recursive: true, force: true });
});

/** Difference of two angles in degrees, wrapped to [-180, 180). */
function angleDiff(a: number, b: number): number {
	return ((((a - b + 180) % 360) + 360) % 360) - 180;
}

describe('StEFCal', () => {
	it('recovers the noise-free P = 8 check to 5e-11 (Salvini & Wijnholds 2014, check via METHODS.md §3)', () => {
		// METHODS.md §3: |g| = 1.0..1.7, phases (0, 30, -45, 60, 90, -120, 150, -170) deg, M = 2.5, tol 1e-10
		// -> recovered to 5e-11, 22 iterations in the reference implementation.
		expect(r.stefcal.noise_free_converged).toBe(true);
		expect(r.stefcal.noise_free_max_err).toBeLessThan(1e-10);
		expect(r.stefcal.noise_free_iterations).toBeLessThanOrEqual(40);
		expect(r.stefcal.batched_max_err).toBeLessThan(1e-10);
	});

	it('agrees with an independent Gauss-Newton least-squares solver (numpy lstsq) on noisy problems', () => {
		// Both minimise the same weighted cost (METHODS.md §3); converged to 1e-12 they agree to rounding.
		expect(r.stefcal.random_max_diff_vs_lstsq).toBeLessThan(1e-8);
		expect(r.stefcal.phase_only_max_diff_vs_lstsq).toBeLessThan(1e-8);
	});

	it('reports SNR_bl * sqrt(N - 1) for equal gains (METHODS.md §3 noise formula)', () => {
		// METHODS.md §3: the SNR formula reduces to SNR_bl sqrt(N-1) for equal gains; its sigma-hat
		// Monte Carlo gave 0.1002 for a true 0.1 at P = 27, so a few per cent is the expected spread.
		expect(r.stefcal.snr_median_p27 / r.stefcal.snr_expected_p27).toBeGreaterThan(0.95);
		expect(r.stefcal.snr_median_p27 / r.stefcal.snr_expected_p27).toBeLessThan(1.05);
	});
});

describe('delay solver', () => {
	it('reproduces the METHODS.md §2 noise-free check table (N_c = 64, 1 MHz, M = 512)', () => {
		// METHODS.md §2 check values (derived there with numpy; grid 1.9531 ns):
		const fft = [3.9062, -7.8125, 11.7188, 150.3906, -498.0469];
		const parabolic = [3.2026, -7.5022, 12.2471, 150.0025, -498.9996];
		const ls = [3.2, -7.5, 12.25, 150, -499];
		fft.forEach((v, i) => expect(r.delay.fft_ns[i]).toBeCloseTo(v, 3));
		parabolic.forEach((v, i) => expect(r.delay.parabolic_ns[i]).toBeCloseTo(v, 3));
		ls.forEach((v, i) => expect(r.delay.ls_ns[i]).toBeCloseTo(v, 6));
	});

	it('solves antenna delays from all 10 baselines of 5 antennas to 1e-6 ns (METHODS.md §2)', () => {
		// METHODS.md §2: tau = (0, 3.2, -7.5, 12.25, 150) ns returned to 1e-6 ns
		const expected = [0, 3.2, -7.5, 12.25, 150];
		expected.forEach((v, i) => expect(Math.abs((r.delay.antenna_ns[i] ?? NaN) - v)).toBeLessThan(1e-6));
	});

	it('honours the search window and leaves out a delay outside it', () => {
		// 150 ns searched within +/- 50 ns: below a band-integrated SNR of 5 (METHODS.md §9 threshold, project choice)
		expect(r.delay.windowed_150_snr).toBeLessThan(5);
		expect(r.delay.windowed_12_ns).toBeCloseTo(12.25, 6);
		expect(r.delay.windowed_12_snr).toBeGreaterThan(1e3);
	});

	it('has the precision METHODS.md §2 predicts (N_c = 64, 1 MHz, SNR_ch = 5 -> 0.215 ns)', () => {
		// METHODS.md §2: predicted 0.215 ns, their Monte Carlo 0.221 ns. With 4000 trials the rms
		// itself scatters by ~1/sqrt(2*4000) = 1.1 %; 10 % allows for the non-Gaussian tail at SNR 5.
		expect(r.delay.mc_rms_ns / 0.215).toBeGreaterThan(0.9);
		expect(r.delay.mc_rms_ns / 0.215).toBeLessThan(1.1);
	});
});

describe('gain interpolation', () => {
	it('reproduces the METHODS.md §6 check (amplitude and unwrapped phase, held outside)', () => {
		// METHODS.md §6: t = -50: 1.0, 170 deg; t = 50: 1.1, 180 deg; t = 150: 1.15, -160 deg; t = 250: 1.1, -150 deg
		const amp = [1.0, 1.1, 1.15, 1.1];
		const phase = [170, 180, -160, -150];
		amp.forEach((v, i) => expect(r.interpolation.amp[i]).toBeCloseTo(v, 9));
		phase.forEach((v, i) => expect(Math.abs(angleDiff(r.interpolation.phase_deg[i] ?? NaN, v))).toBeLessThan(1e-9));
		// real/imag interpolation would give 1.0834 at t = 50 (METHODS.md §6): ours must not
		expect(Math.abs((r.interpolation.amp[1] ?? NaN) - 1.0834)).toBeGreaterThan(0.01);
		expect(r.interpolation.jumps).toBe(0);
	});

	it('uses the nearest solution for the nearest mode and skips flagged solutions', () => {
		// nearest of (0, 100, 200) s to -50, 50 (tie: earlier), 150 (tie: earlier), 250
		expect(r.interpolation.nearest_amp.map((v) => Math.round(v * 1000) / 1000)).toEqual([1.0, 1.0, 1.2, 1.1]);
		// with the middle solution flagged, t = 100 lies halfway between 1.0 and 1.1
		expect(r.interpolation.skip_flagged_amp).toBeCloseTo(1.05, 9);
	});
});

describe('flux bootstrap', () => {
	it('reproduces the METHODS.md §7 check', () => {
		// METHODS.md §7: S = 2.345117, sigma_S = 0.016582, rescale 0.653007
		expect(r.bootstrap.flux).toBeCloseTo(2.345117, 6);
		expect(r.bootstrap.error).toBeCloseTo(0.016582, 6);
		expect(r.bootstrap.rescale).toBeCloseTo(0.653007, 6);
		expect(r.bootstrap.n).toBe(5);
		// an antenna missing from the secondary is dropped, not counted
		expect(r.bootstrap.n_with_dropped).toBe(5);
		expect(r.bootstrap.flux_with_dropped).toBeCloseTo(2.345117, 6);
	});

	it('evaluates the flux models it is given (Perley & Butler 2017 3C286, via METHODS.md §8)', () => {
		// METHODS.md §8 table: S(1.0) = 17.7052, S(1.4) = 15.0838, S(3.0) = 9.9085 Jy
		[17.7052, 15.0838, 9.9085].forEach((v, i) => expect(r.flux_model.pb2017_3c286[i]).toBeCloseTo(v, 3));
		// manual power law 2 Jy at 1.4 GHz, alpha -0.7, at 2.8 GHz: 2 * 2^-0.7 = 1.2311 (arithmetic)
		expect(r.flux_model.power_law_2p8ghz).toBeCloseTo(2 * Math.pow(2, -0.7), 9);
	});
});

describe('program text', () => {
	it('parses as Python 3.9 and imports only numpy and the standard library', () => {
		const script = [
			'import ast, sys',
			'tree = ast.parse(open(sys.argv[1], encoding="utf-8").read(), feature_version=(3, 9))',
			'names = set()',
			'for node in ast.walk(tree):',
			'    if isinstance(node, ast.Import): names.update(a.name.split(".")[0] for a in node.names)',
			'    elif isinstance(node, ast.ImportFrom): names.add((node.module or "").split(".")[0])',
			'print(" ".join(sorted(names)))'
		].join('\n');
		const run = runPython(['-c', script, join(dir, 'calibrate.py')]);
		expect(run.stderr).toBe('');
		const names = run.stdout.trim().split(' ');
		const stdlib = new Set(['argparse', 'datetime', 'hashlib', 'json', 'math', 'os', 'sys', 'time', 'zipfile', 'zlib']);
		for (const name of names) expect(name === 'numpy' || stdlib.has(name), name).toBe(true);
		expect(names).toContain('numpy');
	});
});

describe('parameters block', () => {
	it('carries hostile user text as data, exactly', () => {
		// the test recipe's title, notes and a field name hold quotes, newlines, U+2028 and {{ }}
		const recipe = createSimRecipe();
		expect(r.parameters.title).toBe(recipe.title);
		expect(r.parameters.notes).toBe(recipe.notes);
		expect(r.parameters.fields).toEqual(recipe.fields.map((f) => f.name));
		expect(r.parameters.targets[0]?.field).toBe(recipe.targets[0]?.field);
	});
});
