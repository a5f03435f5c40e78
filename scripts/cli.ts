/**
 * Phasewright command line over the pure calibration library: JSON on stdout, messages on stderr.
 * Exit codes: 0 success, 1 the recipe has errors (validate), 2 bad arguments or unreadable input.
 * Usage: npx tsx scripts/cli.ts <command> [--option value ...]   (npm run cli -- <command> ...)
 *
 * Extending: any module in scripts/cli-commands/*.ts that exports `command: CliCommand` (and `name`) is
 * registered at start, so new commands (e.g. render) need no edit here.
 */
import { existsSync, readdirSync, readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { parseArgs, type ParseArgsConfig } from 'node:util';
import { createDefaultRecipe } from '../src/lib/calibration/defaults';
import { FLUX_STANDARDS, fluxDensity, isWithinValidity, matchStandard, spectralIndex } from '../src/lib/calibration/flux-standards';
import { parseObservation } from '../src/lib/calibration/observation';
import type { ObservationSummary } from '../src/lib/calibration/observation-schema';
import { parseRecipeExportValue, parseRecipeParamsValue, type RecipeParams } from '../src/lib/calibration/recipe';
import type { InputIssue } from '../src/lib/calibration/result';
import { computeAntennaSnr, computeBaselineNoiseJy, computeMinimumIntervalS, roundToIntegrations } from '../src/lib/calibration/sensitivity';
import { hasErrors, parseRulePolicy, validate } from '../src/lib/calibration/validate';

export type CliIo = { readText: (path: string) => string; out: (text: string) => void; err: (text: string) => void };
export type CliValues = Record<string, string | boolean | undefined>;
export type CliCommand = {
	summary: string;
	usage: string;
	options: NonNullable<ParseArgsConfig['options']>;
	run: (values: CliValues, io: CliIo) => number | Promise<number>;
};

/** A bad argument or unreadable input: reported as a message with exit code 2. */
export class CliUsageError extends Error {}

function requireString(values: CliValues, name: string): string {
	const v = values[name];
	if (typeof v !== 'string' || v.length === 0) throw new CliUsageError(`missing --${name}`);
	return v;
}

function readNumber(values: CliValues, name: string, fallback?: number, check?: (x: number) => boolean, expected = 'a positive number'): number {
	const v = values[name];
	if (v === undefined) {
		if (fallback === undefined) throw new CliUsageError(`missing --${name}`);
		return fallback;
	}
	const x = typeof v === 'string' && v.trim() !== '' ? Number(v) : NaN;
	if (!Number.isFinite(x) || !(check ?? ((n) => n > 0))(x)) throw new CliUsageError(`--${name}: expected ${expected}, found ${JSON.stringify(v)}`);
	return x;
}

function formatIssues(what: string, issues: readonly InputIssue[]): string {
	return `${what}:\n${issues.map((i) => `  ${i.path}: ${i.message}`).join('\n')}`;
}

function readFile(io: CliIo, path: string, what: string): string {
	try {
		return io.readText(path);
	} catch (cause) {
		const code = (cause as { code?: string }).code;
		throw new CliUsageError(`cannot read ${what} ${JSON.stringify(path)}${code ? ` (${code})` : ''}`);
	}
}

function loadObservation(io: CliIo, path: string): ObservationSummary {
	const parsed = parseObservation(readFile(io, path, 'observation file'));
	if (!parsed.ok) throw new CliUsageError(formatIssues(`${path} is not a valid observation summary`, parsed.error.issues));
	return parsed.value.summary;
}

function parseJsonFile(io: CliIo, path: string, what: string): unknown {
	try {
		return JSON.parse(readFile(io, path, what));
	} catch (cause) {
		if (cause instanceof CliUsageError) throw cause;
		throw new CliUsageError(`${path} is not valid JSON (${cause instanceof Error ? cause.message : 'unreadable'})`);
	}
}

/** A recipe file is either bare recipe parameters or a `phasewright.recipe` export with its observation. */
function loadRecipe(io: CliIo, path: string): { recipe: RecipeParams; observation: ObservationSummary | null } {
	const value = parseJsonFile(io, path, 'recipe file');
	const isExport = typeof value === 'object' && value !== null && 'format' in value;
	if (isExport) {
		const parsed = parseRecipeExportValue(value);
		if (!parsed.ok) throw new CliUsageError(formatIssues(`${path} is not a valid recipe export`, parsed.error.issues));
		return { recipe: parsed.value.recipe, observation: parsed.value.observation };
	}
	const parsed = parseRecipeParamsValue(value);
	if (!parsed.ok) throw new CliUsageError(formatIssues(`${path} is not a valid recipe`, parsed.error.issues));
	return { recipe: parsed.value, observation: null };
}

const printJson = (io: CliIo, value: unknown) => io.out(`${JSON.stringify(value, null, 2)}\n`);

export const commands: Record<string, CliCommand> = {
	validate: {
		summary: 'check a recipe (bare parameters or a phasewright.recipe export) and print its findings',
		usage: 'validate --recipe R.json [--observation O.json] [--policy P.json]',
		options: { recipe: { type: 'string' }, observation: { type: 'string' }, policy: { type: 'string' } },
		run(values, io) {
			const { recipe, observation: embedded } = loadRecipe(io, requireString(values, 'recipe'));
			const obsPath = values.observation;
			const observation = typeof obsPath === 'string' ? loadObservation(io, obsPath) : embedded;
			let policy = null;
			if (typeof values.policy === 'string') {
				const parsed = parseRulePolicy(parseJsonFile(io, values.policy, 'policy file'));
				if (!parsed.ok) throw new CliUsageError(formatIssues(`${values.policy} is not a valid rule policy`, parsed.error.issues));
				policy = parsed.value;
			}
			const findings = validate(recipe, observation, policy);
			const count = (s: string) => findings.filter((f) => f.severity === s).length;
			printJson(io, { errors: count('error'), warnings: count('warning'), notes: count('note'), findings });
			return hasErrors(findings) ? 1 : 0;
		}
	},
	flux: {
		summary: 'flux density and spectral index of a flux standard at a frequency',
		usage: 'flux --source NAME --freq-hz F',
		options: { source: { type: 'string' }, 'freq-hz': { type: 'string' } },
		run(values, io) {
			const name = requireString(values, 'source');
			const freqHz = readNumber(values, 'freq-hz');
			const match = matchStandard(name, NaN, NaN);
			if (!match) throw new CliUsageError(`--source: ${JSON.stringify(name)} is not a known flux standard (known: ${Object.keys(FLUX_STANDARDS).join(', ')})`);
			const std = FLUX_STANDARDS[match.standard];
			const model = { kind: 'standard', standard: match.standard } as const;
			printJson(io, {
				standard: std.name,
				citation: std.citation,
				freq_hz: freqHz,
				flux_jy: fluxDensity(model, freqHz),
				spectral_index: spectralIndex(model, freqHz),
				within_validity: isWithinValidity(model, freqHz),
				valid_min_hz: std.valid_min_hz,
				valid_max_hz: std.valid_max_hz
			});
			return 0;
		}
	},
	interval: {
		summary: 'shortest solution interval reaching an antenna-based SNR (radiometer equation)',
		usage: 'interval --flux-jy S --sefd-jy E --bandwidth-hz B --antennas N --snr X [--efficiency 1] [--correlations 2] [--integration-s T]',
		options: {
			'flux-jy': { type: 'string' },
			'sefd-jy': { type: 'string' },
			'bandwidth-hz': { type: 'string' },
			antennas: { type: 'string' },
			snr: { type: 'string' },
			efficiency: { type: 'string' },
			correlations: { type: 'string' },
			'integration-s': { type: 'string' }
		},
		run(values, io) {
			const isCount = (min: number, max: number) => (n: number) => Number.isInteger(n) && n >= min && n <= max;
			const input = {
				fluxJy: readNumber(values, 'flux-jy'),
				sefdJy: readNumber(values, 'sefd-jy'),
				bandwidthHz: readNumber(values, 'bandwidth-hz'),
				antennas: readNumber(values, 'antennas', undefined, isCount(2, 100000), 'a whole number of at least 2'),
				snr: readNumber(values, 'snr'),
				efficiency: readNumber(values, 'efficiency', 1, (n) => n > 0 && n <= 1, 'a number in (0, 1]'),
				correlations: readNumber(values, 'correlations', 2, isCount(1, 2), '1 or 2')
			};
			const minimumS = computeMinimumIntervalS(input);
			const result: Record<string, number> = { minimum_s: minimumS };
			if (values['integration-s'] !== undefined) {
				const tInt = readNumber(values, 'integration-s');
				const solutionS = roundToIntegrations(minimumS, tInt);
				result.solution_s = solutionS;
				result.integrations = solutionS / tInt;
				result.snr_at_solution = computeAntennaSnr({ ...input, timeS: solutionS });
				result.baseline_noise_jy_per_integration = computeBaselineNoiseJy({ ...input, timeS: tInt });
			}
			printJson(io, result);
			return 0;
		}
	},
	defaults: {
		summary: 'print the default recipe parameters for an observation',
		usage: 'defaults --observation O.json [--title T]',
		options: { observation: { type: 'string' }, title: { type: 'string' } },
		run(values, io) {
			const observation = loadObservation(io, requireString(values, 'observation'));
			const title = typeof values.title === 'string' ? values.title : undefined;
			printJson(io, createDefaultRecipe(observation, { title }));
			return 0;
		}
	}
};

function describeUsage(): string {
	const lines = Object.entries(commands).map(([name, c]) => `  ${name.padEnd(10)} ${c.summary}\n             ${c.usage}`);
	return `usage: cli <command> [options]\ncommands:\n${lines.join('\n')}\n`;
}

/** Register commands from scripts/cli-commands/*.ts (each exports `name` and `command`). */
async function loadExtraCommands(): Promise<void> {
	const dir = join(dirname(fileURLToPath(import.meta.url)), 'cli-commands');
	if (!existsSync(dir)) return;
	for (const file of readdirSync(dir).filter((f) => f.endsWith('.ts') && !f.endsWith('.test.ts')).sort()) {
		const mod = (await import(pathToFileURL(join(dir, file)).href)) as { name?: unknown; command?: CliCommand };
		if (typeof mod.name === 'string' && mod.command) commands[mod.name] = mod.command;
	}
}

/** Run one command line; returns the exit code. */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
	const [name, ...rest] = argv;
	if (name === undefined || name === 'help' || name === '--help') {
		io.out(describeUsage());
		return name === undefined ? 2 : 0;
	}
	const command = Object.hasOwn(commands, name) ? commands[name] : undefined;
	if (!command) {
		io.err(`unknown command ${JSON.stringify(name)}\n${describeUsage()}`);
		return 2;
	}
	try {
		const { values } = parseArgs({ args: [...rest], options: command.options, strict: true, allowPositionals: false });
		return await command.run(values as CliValues, io);
	} catch (cause) {
		if (cause instanceof CliUsageError || (cause as { code?: string }).code?.startsWith('ERR_PARSE_ARGS')) {
			io.err(`${name}: ${(cause as Error).message}\nusage: cli ${command.usage}\n`);
			return 2;
		}
		throw cause;
	}
}

const isMain = process.argv[1] !== undefined && fileURLToPath(import.meta.url) === process.argv[1];
if (isMain) {
	const io: CliIo = {
		readText: (path) => readFileSync(path, 'utf8'),
		out: (text) => process.stdout.write(text),
		err: (text) => process.stderr.write(text)
	};
	await loadExtraCommands();
	process.exitCode = await runCli(process.argv.slice(2), io);
}
