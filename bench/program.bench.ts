/**
 * bench:program — times the rendered program on a simulated bundle of 40 antennas x 1024
 * channels x 2 correlations x 200 integrations against a floor pass (read every visibility and
 * multiply it by a gain product), reports the program's peak memory against the bundle size, and
 * the median render time. Prints only; no assertions.
 *
 *   npx tsx bench/program.bench.ts
 * Sizes can be reduced for a quick look: BENCH_ANTENNAS, BENCH_CHANNELS, BENCH_RUNS.
 */
import { mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';
import { buildRenderContext } from '../src/lib/script/render-context';
import { compileTemplateSet, renderProgram } from '../src/lib/script/render';
import { createSimRecipe, readTemplateFiles, REPO_ROOT, runPython, simulateBundle, writeProgram } from '../tests/program/program-helpers';
import { median } from './measure';

type Measured = { seconds: number; max_rss_kb: number; status: number; stderr: string; stdout: string };

const antennas = Number(process.env.BENCH_ANTENNAS ?? 40);
const channels = Number(process.env.BENCH_CHANNELS ?? 1024);
const runs = Math.max(3, Number(process.env.BENCH_RUNS ?? 3));
// 200 integrations: flux 20, then gain 10 / target 50 / gain 10 / target 50 / gain 10 / target 40 / gain 10
const schedule = 'flux:20,gain:10,target:50,gain:10,target:50,gain:10,target:40,gain:10';


function measure(args: string[]): Measured {
	const run = runPython([join(REPO_ROOT, 'bench', 'program_measure.py'), ...args]);
	if (run.status !== 0) throw new Error(`measure failed: ${run.stderr}`);
	const m = JSON.parse(run.stdout) as Measured;
	if (m.status !== 0) throw new Error(`command failed (${String(m.status)}): ${m.stderr}`);
	return m;
}

function scale(ch: number): { start: number; end: number }[] {
	return [{ start: Math.round(ch * 0.4), end: Math.round(ch * 0.6) }];
}

const recipe = createSimRecipe((r) => {
	r.clean_channels = scale(channels);
	r.excluded_channels = [{ start: Math.round(channels * 0.47), end: Math.round(channels * 0.47) + 4 }];
});

// render time (the app's path: context + render from the template sources)
const files = readTemplateFiles();
const context = buildRenderContext({ recipe, observation: null, recipeId: 'bench', recipeVersion: 1, templateName: 'standard', templateVersion: 1 });
const renderTimes: number[] = [];
for (let i = 0; i < 30; i++) {
	const t0 = performance.now();
	renderProgram(files, context);
	renderTimes.push(performance.now() - t0);
}
// the same with the template set compiled once (what a server that caches compiled sets pays)
const compiled = compileTemplateSet(files);
const cachedTimes: number[] = [];
if (compiled.ok) {
	for (let i = 0; i < 30; i++) {
		const t0 = performance.now();
		compiled.value.render(context);
		cachedTimes.push(performance.now() - t0);
	}
}

const dir = mkdtempSync(join(tmpdir(), 'phasewright-bench-'));
try {
	const program = writeProgram(dir, recipe);
	const bundle = join(dir, 'bench.npz');
	const t0 = performance.now();
	simulateBundle(bundle, join(dir, 'truth.json'), [
		'--n-ant', String(antennas), '--n-chan', String(channels), '--schedule', schedule, '--sigma', '0.3',
		'--dead-antenna', '7', '--rfi', `${Math.round(channels * 0.1)},${Math.round(channels * 0.1) + 1}`, '--no-truth-bandpass'
	]);
	const simSeconds = (performance.now() - t0) / 1000;
	const bundleBytes = statSync(bundle).size;
	const floor: number[] = [];
	const total: number[] = [];
	const rss: number[] = [];
	let lastStdout = '';
	for (let i = 0; i < runs; i++) {
		floor.push(measure(['python3', join(REPO_ROOT, 'bench', 'program_floor.py'), bundle]).seconds);
		const out = join(dir, `out-${String(i)}`);
		const m = measure(['python3', program, 'run', bundle, '--out', out]);
		total.push(m.seconds);
		rss.push(m.max_rss_kb * 1024);
		lastStdout = m.stdout;
		rmSync(out, { recursive: true, force: true });
	}
	const gib = (b: number): string => `${(b / 2 ** 30).toFixed(2)} GiB`;
	console.log(`bundle: ${String(antennas)} antennas x ${String(channels)} channels x 2 correlations x 200 integrations, ${gib(bundleBytes)} (simulated in ${simSeconds.toFixed(1)} s)`);
	console.log(`floor pass (read + multiply by a gain product): median ${median(floor).toFixed(2)} s of [${floor.map((s) => s.toFixed(2)).join(', ')}]`);
	console.log(`program run: median ${median(total).toFixed(2)} s of [${total.map((s) => s.toFixed(2)).join(', ')}]`);
	console.log(`ratio run / floor: ${(median(total) / median(floor)).toFixed(2)} (target <= 10)`);
	console.log(`peak memory of the run: ${gib(Math.max(...rss))} = ${(Math.max(...rss) / bundleBytes).toFixed(2)} x the bundle (target <= 3)`);
	console.log(`render (compile + render): median ${median(renderTimes).toFixed(2)} ms over ${String(renderTimes.length)} renders (target < 5 ms)`);
	if (cachedTimes.length) console.log(`render of a compiled set: median ${median(cachedTimes).toFixed(2)} ms`);
	console.log('last run, per step:');
	for (const line of lastStdout.split('\n')) if (line.startsWith('[')) console.log(`  ${line}`);
} finally {
	rmSync(dir, { recursive: true, force: true });
}
