/**
 * Bad input to the rendered program: a specific one-line message, exit code 2, no traceback,
 * and the input file left exactly as it was.
 */
import { createHash } from 'node:crypto';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { createSimRecipe, runPython, SIMULATOR, simulateBundle, writeProgram } from './program-helpers';

// each test runs python3 on simulated data: allow for a busy 2-core machine
vi.setConfig({ testTimeout: 60_000 });

let dir = '';
let program = '';
let good = '';

function sha256File(path: string): string {
	return createHash('sha256').update(readFileSync(path)).digest('hex');
}

function makeBad(kind: string): string {
	const out = join(dir, `bad-${kind}.npz`);
	const run = runPython([SIMULATOR, 'bad', '--from', good, '--kind', kind, '--out', out]);
	if (run.status !== 0) throw new Error(`simulate.py bad ${kind} failed:\n${run.stderr}`);
	return out;
}

function expectRefused(bundle: string, outDir: string, pattern: RegExp, extra: string[] = []): void {
	const before = sha256File(bundle);
	const run = runPython([program, 'run', bundle, '--out', outDir, ...extra]);
	expect(run.status).toBe(2);
	expect(run.stderr).toMatch(/^error: /);
	expect(run.stderr).toMatch(pattern);
	expect(run.stderr).not.toContain('Traceback');
	expect(run.stderr.trim().split('\n')).toHaveLength(1);
	expect(sha256File(bundle)).toBe(before);
}

beforeAll(() => {
	dir = mkdtempSync(join(tmpdir(), 'phasewright-bad-'));
	program = writeProgram(dir, createSimRecipe());
	good = join(dir, 'good.npz');
	simulateBundle(good, join(dir, 'truth.json'), ['--n-ant', '6', '--n-chan', '64', '--n-int', '3', '--no-truth-bandpass']);
}, 60_000);

afterAll(() => {
	if (dir) rmSync(dir, { recursive: true, force: true });
});

describe('bad bundles', () => {
	it('rejects a file of another format by its tag', () => {
		expectRefused(makeBad('wrong_format'), join(dir, 'o1'), /format is 'another\.visibility-format', expected 'phasewright\.visibility-bundle'/);
	});

	it('rejects a newer format version with a clear message', () => {
		expectRefused(makeBad('newer_version'), join(dir, 'o2'), /format version 2 is newer than this program reads \(1\)/);
	});

	it('names a missing required key', () => {
		expectRefused(makeBad('missing_key'), join(dir, 'o3'), /required key\(s\) missing: chan_freq/);
	});

	it('names a key with the wrong dtype', () => {
		expectRefused(makeBad('wrong_dtype'), join(dir, 'o4'), /key 'vis' has dtype complex128 but must be complex64/);
	});

	it('names arrays whose shapes do not belong together', () => {
		expectRefused(makeBad('bad_shape'), join(dir, 'o5'), /key 'flag' has shape/);
	});

	it('says a truncated file is not a readable .npz file', () => {
		expectRefused(makeBad('truncated'), join(dir, 'o6'), /is not a readable \.npz file/);
	});

	it('says a text file is not a readable .npz file', () => {
		expectRefused(makeBad('not_npz'), join(dir, 'o7'), /is not a readable \.npz file/);
	});

	it('reports a missing input file', () => {
		const run = runPython([program, 'run', join(dir, 'nowhere.npz'), '--out', join(dir, 'o8')]);
		expect(run.status).toBe(2);
		expect(run.stderr).toMatch(/^error: .*no such file/);
		expect(existsSync(join(dir, 'o8'))).toBe(false);
	});

	it('rejects bad bundles in summarize too', () => {
		const run = runPython([program, 'summarize', makeBad('newer_version')]);
		expect(run.status).toBe(2);
		expect(run.stderr).toMatch(/^error: .*newer than this program reads/);
	});
});

describe('recipe and bundle that do not belong together', () => {
	it('refuses a bundle that has none of the recipe’s fields', () => {
		const other = writeProgram(
			join(dir, 'other'),
			createSimRecipe(undefined, { flux: 'Elsewhere A', gain: 'Elsewhere B', target: 'Elsewhere C' })
		);
		const before = sha256File(good);
		const run = runPython([other, 'run', good, '--out', join(dir, 'o9')]);
		expect(run.status).toBe(2);
		expect(run.stderr).toMatch(/^error: none of the recipe's fields \(Elsewhere A, Elsewhere B, Elsewhere C\) is in .* check that the bundle belongs to this recipe/);
		expect(sha256File(good)).toBe(before);
	});
});

describe('output folder', () => {
	it('refuses a non-empty output folder unless --overwrite is given', () => {
		const out = join(dir, 'taken');
		mkdirSync(out);
		writeFileSync(join(out, 'keep.txt'), 'mine');
		expectRefused(good, out, /output folder .* already exists and is not empty; choose another --out or pass --overwrite/);
		expect(readdirSync(out)).toEqual(['keep.txt']);
		const run = runPython([program, 'run', good, '--out', out, '--overwrite']);
		expect(run.status, run.stderr).toBe(0);
		expect(readdirSync(out).sort()).toEqual(['calibrated.npz', 'keep.txt', 'report.json', 'solutions.npz']);
	});

	it('refuses to write over its own input', () => {
		const out = join(dir, 'self');
		mkdirSync(out);
		const input = join(out, 'calibrated.npz');
		writeFileSync(input, readFileSync(good));
		expectRefused(input, out, /would replace the input bundle/, ['--overwrite']);
	});
});
