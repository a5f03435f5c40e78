import { execFile } from 'node:child_process';
import { createHash, randomUUID } from 'node:crypto';
import { mkdir, readFile, rename, rm, stat, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { ObservationSummary } from '$lib/calibration/observation';
import { rankSummaryAntennas } from '$lib/calibration/reference-antenna';
import { createDefaultRecipe } from '$lib/calibration/defaults';

/*
 * The demo observation's simulated visibility bundle (issue 4, item 5). It is made on first request by the
 * project's simulator (tests/program/simulate.py, numpy only) and kept in a cache folder under the system's
 * temporary directory, named by the observation's SHA-256 and a hash of the simulator and its arguments, so a
 * changed simulator makes a new file. python3 runs through execFile with an argument array: no shell, and no
 * user text reaches the command line (only the cache paths and antenna names from the stored summary).
 */

/** The upload filename the seed gives the demo observation (see services/seed.ts). */
export const DEMO_OBSERVATION_FILENAME = 'corrie-flats-demo.json';
/** The name the bundle is offered under. */
export const DEMO_BUNDLE_FILENAME = 'corrie-flats-demo-simulated.npz';
/** Antennas that get data: few enough for a bundle of a few MB, enough for robust solves (>= 4 baselines each). */
export const DEMO_ANTENNA_COUNT = 8;
/** One integration per scan keeps 8 antennas x 1024 channels x 2 correlations at ~0.46 MB per scan. */
export const DEMO_INTEGRATIONS_PER_SCAN = 1;
const DEFAULT_TIMEOUT_MS = 60_000;
const SIMULATOR_PATH = ['tests', 'program', 'simulate.py'];

export type DemoBundleFailure = {
	code: 'python_missing' | 'numpy_missing' | 'simulator_missing' | 'simulation_failed' | 'timeout';
	message: string;
};
export type DemoBundleResult = { ok: true; path: string; sizeBytes: number; generated: boolean } | { ok: false; error: DemoBundleFailure };
export type DemoBundleOptions = {
	/** Folder for the cached bundles; default `<tmpdir>/phasewright-demo-bundles`. */
	cacheDir?: string;
	/** The project folder holding tests/program/simulate.py; default process.cwd() (the built app runs from it). */
	projectDir?: string;
	/** The python executable; default `python3` from PATH. */
	python?: string;
	timeoutMs?: number;
};

/** Whether an observation is the seeded demo observation (the only one with a simulated bundle). */
export function isDemoObservation(o: { originalFilename: string }): boolean {
	return o.originalFilename === DEMO_OBSERVATION_FILENAME;
}

/**
 * The antennas that get rows: the default recipe's reference antenna and fallbacks first, then eligible
 * antennas spread over the rest of the ranking (near the centre to the outskirts), so the bundle has short
 * and long baselines. The others stay in the bundle's antenna list without rows.
 */
export function selectDemoAntennas(summary: ObservationSummary, count = DEMO_ANTENNA_COUNT): string[] {
	const recipe = createDefaultRecipe(summary);
	const chosen: string[] = [];
	const add = (name: string) => {
		if (name && !chosen.includes(name) && chosen.length < count) chosen.push(name);
	};
	add(recipe.reference_antenna.primary);
	for (const name of recipe.reference_antenna.fallbacks) add(name);
	const flagged = new Set(summary.flagged_antennas ?? []);
	const rest = rankSummaryAntennas(summary)
		.filter((r) => r.eligible && !chosen.includes(r.name) && !flagged.has(r.name))
		.map((r) => r.name);
	const wanted = count - chosen.length;
	for (let k = 0; k < wanted && rest.length > 0; k++) {
		const index = wanted === 1 ? 0 : Math.round((k * (rest.length - 1)) / (wanted - 1));
		const name = rest[index];
		if (name !== undefined) add(name);
	}
	for (const name of rest) add(name); // if rounding picked one twice
	return chosen;
}

/** The simulator's arguments after `observation --summary S --out O` for the demo bundle. */
export function buildDemoSimulatorArgs(summary: ObservationSummary): string[] {
	return [
		'--antennas',
		selectDemoAntennas(summary).join(','),
		'--scans',
		'shortest',
		'--max-integrations-per-scan',
		String(DEMO_INTEGRATIONS_PER_SCAN),
		'--seed',
		'20260314'
	];
}

/** Where the simulator lives in the project folder. */
export function locateSimulator(projectDir: string = process.cwd()): string {
	return join(projectDir, ...SIMULATOR_PATH);
}

type RunOutcome = { ok: true } | { ok: false; error: DemoBundleFailure };

function runPython(python: string, args: string[], timeoutMs: number, cwd: string): Promise<RunOutcome> {
	return new Promise((resolve) => {
		execFile(python, args, { cwd, timeout: timeoutMs, maxBuffer: 4 * 1024 * 1024, windowsHide: true }, (err, _stdout, stderr) => {
			if (!err) return resolve({ ok: true });
			const e = err as NodeJS.ErrnoException & { killed?: boolean; signal?: string | null };
			const text = String(stderr);
			if (e.code === 'ENOENT') {
				return resolve({
					ok: false,
					error: {
						code: 'python_missing',
						message: `python3 was not found on the server ("${python}"), so the simulated bundle cannot be made. Install python3 with numpy 1.24 or newer and try again.`
					}
				});
			}
			if (e.killed || e.signal === 'SIGTERM') {
				return resolve({ ok: false, error: { code: 'timeout', message: `The simulator did not finish within ${Math.round(timeoutMs / 1000)} s; try again later.` } });
			}
			if (/No module named .?numpy/.test(text)) {
				return resolve({
					ok: false,
					error: {
						code: 'numpy_missing',
						message: `numpy is not installed for the server's python3 ("${python}"), so the simulated bundle cannot be made. Install numpy 1.24 or newer (Debian: python3-numpy) and try again.`
					}
				});
			}
			const last = text.trim().split('\n').slice(-1)[0] ?? '';
			return resolve({ ok: false, error: { code: 'simulation_failed', message: `The simulator failed${last ? `: ${last.slice(0, 300)}` : ''}.` } });
		});
	});
}

async function sizeOf(path: string): Promise<number | null> {
	try {
		const s = await stat(path);
		return s.isFile() && s.size > 0 ? s.size : null;
	} catch {
		return null;
	}
}

const pending = new Map<string, Promise<DemoBundleResult>>();

/**
 * The path of the demo observation's simulated bundle, made on first call. The file is written under a
 * temporary name and renamed into place, so concurrent requests (and processes) never see a half file;
 * calls for the same bundle in one process share one simulator run.
 */
export async function ensureDemoBundle(summary: ObservationSummary, observationSha256: string, options: DemoBundleOptions = {}): Promise<DemoBundleResult> {
	if (!/^[0-9a-f]{64}$/.test(observationSha256)) throw new Error('ensureDemoBundle: observationSha256 must be 64 lowercase hex digits');
	const projectDir = options.projectDir ?? process.cwd();
	const simulator = locateSimulator(projectDir);
	let simulatorBytes: Buffer;
	try {
		simulatorBytes = await readFile(simulator);
	} catch {
		return { ok: false, error: { code: 'simulator_missing', message: `The simulator was not found at ${simulator}; run the app from the project folder.` } };
	}
	const args = buildDemoSimulatorArgs(summary);
	const variant = createHash('sha256').update(simulatorBytes).update('\0').update(JSON.stringify(args)).digest('hex').slice(0, 16);
	const cacheDir = options.cacheDir ?? join(tmpdir(), 'phasewright-demo-bundles');
	const path = join(cacheDir, `${observationSha256}-${variant}.npz`);
	const existing = await sizeOf(path);
	if (existing !== null) return { ok: true, path, sizeBytes: existing, generated: false };
	const running = pending.get(path);
	if (running) return running;
	const job = generate({ path, cacheDir, summary, simulator, args, projectDir, python: options.python ?? 'python3', timeoutMs: options.timeoutMs ?? DEFAULT_TIMEOUT_MS });
	pending.set(path, job);
	try {
		return await job;
	} finally {
		pending.delete(path);
	}
}

async function generate(input: {
	path: string;
	cacheDir: string;
	summary: ObservationSummary;
	simulator: string;
	args: string[];
	projectDir: string;
	python: string;
	timeoutMs: number;
}): Promise<DemoBundleResult> {
	await mkdir(input.cacheDir, { recursive: true, mode: 0o700 });
	const stem = `${input.path}.${randomUUID()}`;
	const summaryPath = `${stem}.summary.json`;
	const partialPath = `${stem}.partial`;
	try {
		await writeFile(summaryPath, JSON.stringify(input.summary), { encoding: 'utf8', mode: 0o600 });
		const run = await runPython(input.python, [input.simulator, 'observation', '--summary', summaryPath, '--out', partialPath, ...input.args], input.timeoutMs, input.projectDir);
		if (!run.ok) return run;
		const size = await sizeOf(partialPath);
		if (size === null) return { ok: false, error: { code: 'simulation_failed', message: 'The simulator finished but wrote no bundle.' } };
		await rename(partialPath, input.path);
		return { ok: true, path: input.path, sizeBytes: size, generated: true };
	} finally {
		await rm(summaryPath, { force: true });
		await rm(partialPath, { force: true });
	}
}
