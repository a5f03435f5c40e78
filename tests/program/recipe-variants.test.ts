/**
 * The program rendered from recipe variants: every solution-interval mode, phase-only gains,
 * nearest-neighbour transfer, missing steps and fields the bundle does not have.
 */
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import type { RecipeParamsInput } from '../../src/lib/calibration/recipe';
import { createSimRecipe, REPO_ROOT, runPython, SIM_FIELDS, simulateBundle, writeProgram } from './program-helpers';

// each test runs python3 on simulated data: allow for a busy 2-core machine
vi.setConfig({ testTimeout: 60_000 });

type Report = {
	steps: { kind: string; n_solutions: number; n_failed: number }[];
	gain?: { time_s: number[]; field: string[]; amplitude: (number | null)[][][]; phase_deg: (number | null)[][][] };
	flux: { field: string; derived_jy: number | null }[];
	delay?: unknown;
	bandpass?: unknown;
	checks: { code: string; status: string }[];
};

let dir = '';
let bundle = '';
let counter = 0;
// Simulation set-up: flux-calibrator scan of 20 integrations of 8 s, then gain/target/gain/target/gain
// scans of 10 integrations (80 s); 8 antennas, no dead antenna.
const SIM = ['--n-ant', '8', '--n-chan', '64', '--sigma', '0.1', '--schedule', 'flux:20,gain,target,gain,target,gain'];

function runVariant(change: (r: RecipeParamsInput) => void): { status: number | null; stderr: string; stdout: string; report: Report | null } {
	counter += 1;
	const sub = join(dir, `v${String(counter)}`);
	const program = writeProgram(sub, createSimRecipe(change));
	const run = runPython([program, 'run', bundle, '--out', join(sub, 'out')]);
	const report = run.status === 0 ? (JSON.parse(readFileSync(join(sub, 'out', 'report.json'), 'utf8')) as Report) : null;
	return { status: run.status, stderr: run.stderr, stdout: run.stdout, report };
}

function gainStep(r: RecipeParamsInput): Extract<RecipeParamsInput['steps'][number], { kind: 'gain' }> {
	const step = r.steps.find((s) => s.kind === 'gain');
	if (!step || step.kind !== 'gain') throw new Error('test recipe has no gain step');
	return step;
}

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'phasewright-variants-'));
	bundle = join(dir, 'sim.npz');
	simulateBundle(bundle, join(dir, 'truth.json'), SIM);
}, 60_000);

afterAll(() => {
	if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('solution intervals', () => {
	it('makes one gain solution per 40 s bin within each scan', () => {
		// 160 s flux scan -> 4 bins; three 80 s gain scans -> 2 bins each
		const v = runVariant((r) => {
			gainStep(r).interval = { mode: 'seconds', seconds: 40 };
		});
		expect(v.status, v.stderr).toBe(0);
		expect(v.report?.gain?.time_s).toHaveLength(4 + 3 * 2);
	});

	it('makes one gain solution per scan, and one per field for the whole observation', () => {
		const perScan = runVariant((r) => {
			gainStep(r).interval = { mode: 'scan' };
		});
		expect(perScan.status, perScan.stderr).toBe(0);
		expect(perScan.report?.gain?.time_s).toHaveLength(1 + 3);
		const whole = runVariant((r) => {
			gainStep(r).interval = { mode: 'observation' };
		});
		expect(whole.status, whole.stderr).toBe(0);
		expect(whole.report?.gain?.field).toEqual([SIM_FIELDS.flux, SIM_FIELDS.gain]);
		// the bootstrap does not depend on how the gains were binned (2 % as in calibrate-run.test.ts)
		const flux = whole.report?.flux[0]?.derived_jy ?? NaN;
		expect(Math.abs(flux / 2.345 - 1)).toBeLessThan(0.02);
	});
});

describe('gain variants', () => {
	it('solves phase-only gains with unit amplitude and skips the bootstrap', () => {
		const v = runVariant((r) => {
			const g = gainStep(r);
			g.solve_for = 'phase';
			g.min_snr = 3;
		});
		expect(v.status, v.stderr).toBe(0);
		const amps = (v.report?.gain?.amplitude ?? []).flat(2).filter((a): a is number => a !== null);
		expect(amps.length).toBeGreaterThan(0);
		for (const a of amps) expect(a).toBeCloseTo(1, 9);
		expect(v.stdout).toContain('flux bootstrap skipped');
		expect(v.report?.flux[0]?.derived_jy ?? null).toBeNull();
	});

	it.each(['linear', 'nearest'] as const)('corrects the target with K, B and its calibrator’s gains (%s transfer)', (mode) => {
		const v = runVariant((r) => {
			const t = r.targets[0];
			if (t) t.interpolation = mode;
		});
		expect(v.status, v.stderr).toBe(0);
		// check_apply.py recomputes raw/corrected from solutions.npz with its own interpolation (METHODS.md §6)
		const check = runPython([join(REPO_ROOT, 'tests', 'program', 'check_apply.py'), bundle, join(dir, `v${String(counter)}`, 'out'), SIM_FIELDS.target, SIM_FIELDS.gain, mode]);
		expect(check.status, check.stderr).toBe(0);
		const res = JSON.parse(check.stdout) as { max_rel_diff: number; n: number; n_total: number };
		expect(res.n).toBeGreaterThan(0.9 * res.n_total);
		// float32 data and float64 arithmetic: agreement to ~1e-6 relative
		expect(res.max_rel_diff).toBeLessThan(1e-4);
	});
});

describe('partial recipes', () => {
	it('runs without delay and provisional phase steps', () => {
		const v = runVariant((r) => {
			r.steps = r.steps.filter((s) => s.kind !== 'delay' && s.kind !== 'bandpass_prep');
		});
		expect(v.status, v.stderr).toBe(0);
		expect(v.report?.steps.map((s) => s.kind)).toEqual(['bandpass', 'gain', 'flux_bootstrap', 'apply', 'verify']);
		expect(v.report?.delay).toBeUndefined();
		expect(v.report?.bandpass).toBeDefined();
	});

	it('warns about fields the bundle does not have and still runs', () => {
		const v = runVariant((r) => {
			gainStep(r).fields.push('Not In This Bundle');
		});
		expect(v.status, v.stderr).toBe(0);
		expect(v.stdout).toContain("warning: field 'Not In This Bundle' is not in this bundle");
	});

	it('plans a recipe with only the apply step', () => {
		counter += 1;
		const program = writeProgram(
			join(dir, `v${String(counter)}`),
			createSimRecipe((r) => {
				r.steps = [{ kind: 'apply', fields: [SIM_FIELDS.target] }];
			})
		);
		const plan = runPython([program, 'plan']);
		expect(plan.status, plan.stderr).toBe(0);
		expect(plan.stdout).toContain('1. apply:');
		expect(plan.stdout).not.toContain('2.');
	});
});

describe('hostile names end to end', () => {
	it('runs with field names full of quotes, newlines, NUL, separators and a lone surrogate, keeping them as data', () => {
		const hostileBundle = join(dir, 'hostile.npz');
		const truth = simulateBundle(hostileBundle, join(dir, 'hostile.json'), [...SIM, '--hostile-names']) as { fields: { flux: string; gain: string; target: string } };
		const names = truth.fields;
		expect(names.gain).toContain('\u2028');
		const sub = join(dir, 'hostile');
		const program = writeProgram(sub, createSimRecipe(undefined, names));
		const plan = runPython([program, 'plan']);
		expect(plan.status, plan.stderr).toBe(0);
		const run = runPython([program, 'run', hostileBundle, '--out', join(sub, 'out')]);
		expect(run.status, run.stderr).toBe(0);
		for (const output of [plan.stdout, run.stdout]) {
			// no name's code ran (it would have printed "pwned" on a line of its own) and no name broke a line
			expect(output.split('\n')).not.toContain('pwned');
			expect(output.split('\n').some((line) => line.startsWith('__import__'))).toBe(false);
			expect(output).not.toContain('\u2028');
		}
		const report = JSON.parse(readFileSync(join(sub, 'out', 'report.json'), 'utf8')) as Report & { diagnostics: Record<string, unknown> };
		expect(report.flux[0]?.field).toBe(names.gain);
		expect(Object.keys(report.diagnostics).sort()).toEqual([names.flux, names.gain, names.target].sort());
		expect(Math.abs((report.flux[0]?.derived_jy ?? NaN) / 2.345 - 1)).toBeLessThan(0.02);
		const summary = runPython([program, 'summarize', hostileBundle]);
		expect(summary.status, summary.stderr).toBe(0);
		const parsed = JSON.parse(summary.stdout) as { fields: { name: string }[]; array: { name: string; antennas: { name: string }[] } };
		expect(parsed.fields.map((f) => f.name)).toEqual([names.flux, names.gain, names.target]);
		// bundle-only names may hold a lone surrogate; the JSON escapes it and it comes back intact
		expect(parsed.array.name).toContain('\ud800');
		expect(parsed.array.antennas.at(-1)?.name).toBe('A08 \ud800\n\u202e');
	});
});

describe('wide windows', () => {
	it('averages a bandpass of more than 1024 channels into 1024 bins for the report', () => {
		const wide = join(dir, 'wide.npz');
		simulateBundle(wide, join(dir, 'wide.json'), ['--n-ant', '6', '--n-chan', '2048', '--sigma', '0.1', '--schedule', 'flux:4,gain:2,target:2,gain:2', '--no-truth-bandpass']);
		const sub = join(dir, 'wide');
		const program = writeProgram(
			sub,
			createSimRecipe((r) => {
				r.clean_channels = [{ start: 900, end: 1100 }];
				r.excluded_channels = [{ start: 1000, end: 1003 }];
			})
		);
		const run = runPython([program, 'run', wide, '--out', join(sub, 'out')]);
		expect(run.status, run.stderr).toBe(0);
		const report = JSON.parse(readFileSync(join(sub, 'out', 'report.json'), 'utf8')) as {
			bandpass: { chan_freq_hz: number[]; amplitude: (number | null)[][][]; flag: boolean[][][] };
		};
		const freq = report.bandpass.chan_freq_hz;
		expect(freq).toHaveLength(1024);
		// simulator input: 2048 channels of 500 MHz / 2048 from 1.0 GHz; bin k holds channels 2k and 2k+1
		const width = 500e6 / 2048;
		expect(freq[0]).toBeCloseTo(1e9 + 0.5 * width, 3);
		expect(freq[1023]).toBeCloseTo(1e9 + 2046.5 * width, 3);
		expect(report.bandpass.amplitude[0]).toHaveLength(1024);
		// the bins of excluded channels 1000-1003 (bins 500 and 501) are flagged
		expect(report.bandpass.flag[1]?.[500]).toEqual([true, true]);
		expect(report.bandpass.flag[1]?.[502]).toEqual([false, false]);
	});
});

describe('non-finite samples', () => {
	it('flags NaN and infinite visibilities instead of letting them spread', () => {
		const nan = join(dir, 'nan.npz');
		const inject = [
			'import sys, numpy as np',
			'a = dict(np.load(sys.argv[1]))',
			'v = a["vis"].copy()',
			'v[5, 3, 1] = np.nan; v[100, 7, 0] = np.inf; v[200, 9, 1] = 3e38; v[200, 10, 1] = 3e38',
			'a["vis"] = v',
			'np.savez(sys.argv[2], **a)'
		].join('\n');
		expect(runPython(['-c', inject, bundle, nan]).status).toBe(0);
		const sub = join(dir, 'nan');
		const program = writeProgram(sub, createSimRecipe());
		const run = runPython([program, 'run', nan, '--out', join(sub, 'out')]);
		expect(run.status, run.stderr).toBe(0);
		const probe = [
			'import json, sys, numpy as np',
			'a = np.load(sys.argv[1] + "/calibrated.npz")',
			'order = np.lexsort((a["ant2"], a["ant1"], a["time"]))',
			'v = a["vis"][order]; f = a["flag"][order]',
			'print(json.dumps({"finite": bool(np.isfinite(v).all()), "zero_where_flagged": bool(np.all(v[f] == 0)),',
			' "flagged": [bool(f[5, 3, 1]), bool(f[100, 7, 0])]}))'
		].join('\n');
		const res = runPython(['-c', probe, join(sub, 'out')]);
		expect(res.stderr).toBe('');
		// the simulator writes rows time-major in baseline order, so sorting restores the row numbers
		expect(JSON.parse(res.stdout)).toEqual({ finite: true, zero_where_flagged: true, flagged: [true, true] });
		// on reading, exactly the two non-finite samples are flagged: the huge finite pair, whose
		// channel sum overflows to infinity, passes the sample-by-sample test
		const load = [
			'import importlib.util, json, sys, numpy as np',
			'spec = importlib.util.spec_from_file_location("prog", sys.argv[1]); prog = importlib.util.module_from_spec(spec); spec.loader.exec_module(prog)',
			'b = prog.load_bundle(sys.argv[2])',
			'raw = np.load(sys.argv[2])["flag"]',
			'print(json.dumps(np.argwhere(b.flag & ~raw).tolist()))'
		].join('\n');
		const loaded = runPython(['-c', load, program, nan]);
		expect(loaded.stderr).toBe('');
		expect(JSON.parse(loaded.stdout)).toEqual([
			[5, 3, 1],
			[100, 7, 0]
		]);
	});
});
