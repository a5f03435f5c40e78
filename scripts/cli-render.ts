/**
 * `render --recipe R.json [--template NAME@VERSION] [--observation O.json]`: renders a
 * recipe file with the starter templates in `templates/` and prints the program.
 * The recipe file may be bare recipe parameters or a `phasewright.recipe` export.
 * Offline there is no template store, so only the starter set as it is on disk
 * (`standard@1`) is available. A file has no saved version: it renders as recipe id
 * "local", version 0.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { basename, join, relative, sep } from 'node:path';
import { fileURLToPath } from 'node:url';
import { parseJsonText } from '../src/lib/calibration/format-header';
import { parseObservation } from '../src/lib/calibration/observation';
import { parseRecipeExportValue, parseRecipeParamsValue, type RecipeParams } from '../src/lib/calibration/recipe';
import type { InputIssue } from '../src/lib/calibration/result';
import { renderProgram } from '../src/lib/script/render';
import { buildRenderContext } from '../src/lib/script/render-context';
import { TemplateError } from '../src/lib/script/template-error';
import type { CliCommand } from './cli';

const STARTER_TEMPLATE = { name: 'standard', version: 1 } as const;
const LOCAL_RECIPE_ID = 'local';
const LOCAL_RECIPE_VERSION = 0;
const RECIPE_LIMITS = { maxBytes: 6_000_000, maxDepth: 24 };
const USAGE = 'usage: render --recipe R.json [--template standard@1] [--observation O.json]';

/** Where output goes, how files are read and where the starter templates are; tests pass their own. */
export type RenderCommandIo = {
	writeOut: (text: string) => void;
	writeErr: (text: string) => void;
	templatesDir: string;
	readText?: (path: string) => string;
};

const STARTER_TEMPLATES_DIR = fileURLToPath(new URL('../templates/', import.meta.url));

let stdoutGuarded = false;

/** Writes to stdout; a reader that closes early (`| head`) ends the output quietly instead of with a stack trace. */
function writeStdout(text: string): void {
	if (!stdoutGuarded) {
		stdoutGuarded = true;
		process.stdout.on('error', (error: NodeJS.ErrnoException) => {
			if (error.code === 'EPIPE') process.exit(0);
			process.stderr.write(`render: cannot write the program to stdout (${error.code ?? error.message})\n`);
			process.exit(1);
		});
	}
	process.stdout.write(text);
}

const DEFAULT_IO: RenderCommandIo = {
	writeOut: writeStdout,
	writeErr: (text) => process.stderr.write(text),
	templatesDir: STARTER_TEMPLATES_DIR
};

/** Exit codes as in scripts/cli.ts: 2 for bad arguments or unreadable input, 1 when the templates fail. */
class CommandFailure extends Error {
	constructor(
		readonly exitCode: 1 | 2,
		message: string,
		readonly issues: InputIssue[] = []
	) {
		super(message);
	}
}

type RenderOptions = { recipe: string; template: string | null; observation: string | null };

function parseArguments(args: readonly string[]): RenderOptions {
	const options: RenderOptions = { recipe: '', template: null, observation: null };
	for (let i = 0; i < args.length; i += 2) {
		const flag = args[i] ?? '';
		const value = args[i + 1];
		if (flag !== '--recipe' && flag !== '--template' && flag !== '--observation') {
			throw new CommandFailure(2, `unknown argument "${flag}"\n${USAGE}`);
		}
		if (value === undefined || value.startsWith('--')) throw new CommandFailure(2, `${flag} needs a value\n${USAGE}`);
		options[flag.slice(2) as keyof RenderOptions] = value;
	}
	if (options.recipe === '') throw new CommandFailure(2, `--recipe is required\n${USAGE}`);
	return options;
}

function parseTemplateName(text: string): { name: string; version: number } {
	const match = /^([A-Za-z0-9_-]+)@([1-9][0-9]*)$/.exec(text);
	if (!match) throw new CommandFailure(2, `--template must look like NAME@VERSION, e.g. standard@1 (found "${text}")`);
	return { name: match[1] ?? '', version: Number(match[2]) };
}

function requireStarterTemplate(template: { name: string; version: number }, origin: string): void {
	if (template.name !== STARTER_TEMPLATE.name || template.version !== STARTER_TEMPLATE.version) {
		throw new CommandFailure(
			2,
			`${origin} asks for template ${template.name}@${template.version}, but the command line renders with the starter set ` +
				`(${STARTER_TEMPLATE.name}@${STARTER_TEMPLATE.version}, the files in templates/) only; ` +
				'render other template versions in the app, or pass --template standard@1'
		);
	}
}

function readText(io: RenderCommandIo, path: string, what: string): string {
	try {
		return io.readText ? io.readText(path) : readFileSync(path, 'utf8');
	} catch (cause) {
		const code = (cause as { code?: unknown }).code;
		throw new CommandFailure(2, `cannot read the ${what} file ${path}${typeof code === 'string' ? ` (${code})` : ''}`);
	}
}

/** Reads bare recipe parameters or a `phasewright.recipe` export; returns the params and the export's template. */
function readRecipeFile(io: RenderCommandIo, path: string): { recipe: RecipeParams; template: { name: string; version: number } | null } {
	const json = parseJsonText(readText(io, path, 'recipe'), RECIPE_LIMITS);
	if (!json.ok) throw new CommandFailure(2, `${path} is not a readable recipe file`, [json.issue]);
	const isExport = typeof json.value === 'object' && json.value !== null && 'format' in json.value;
	if (isExport) {
		const parsed = parseRecipeExportValue(json.value);
		if (!parsed.ok) throw new CommandFailure(2, `${path} is not a valid phasewright.recipe export`, parsed.error.issues);
		return { recipe: parsed.value.recipe, template: parsed.value.template };
	}
	const parsed = parseRecipeParamsValue(json.value);
	if (!parsed.ok) throw new CommandFailure(2, `${path} is not valid recipe parameters (nor a phasewright.recipe export)`, parsed.error.issues);
	return { recipe: parsed.value, template: null };
}

/** Reads every `.hbs` file under a templates folder, keyed by its path relative to that folder. */
export function readTemplateDirectory(root: string, dir = root): Record<string, string> {
	const files: Record<string, string> = {};
	for (const name of readdirSync(dir).sort()) {
		const path = join(dir, name);
		if (statSync(path).isDirectory()) Object.assign(files, readTemplateDirectory(root, path));
		else if (name.endsWith('.hbs')) files[relative(root, path).split(sep).join('/')] = readFileSync(path, 'utf8');
	}
	return files;
}

function runRender(options: RenderOptions, io: RenderCommandIo): string {
	const requested = options.template === null ? null : parseTemplateName(options.template);
	const { recipe, template } = readRecipeFile(io, options.recipe);
	if (requested) requireStarterTemplate(requested, '--template');
	else if (template) requireStarterTemplate(template, `the export ${basename(options.recipe)}`);

	let observation = null;
	if (options.observation !== null) {
		const parsed = parseObservation(readText(io, options.observation, 'observation'));
		if (!parsed.ok) throw new CommandFailure(2, `${options.observation} is not a valid observation summary`, parsed.error.issues);
		observation = parsed.value.summary;
	}
	const context = buildRenderContext({
		recipe,
		observation,
		recipeId: LOCAL_RECIPE_ID,
		recipeVersion: LOCAL_RECIPE_VERSION,
		templateName: STARTER_TEMPLATE.name,
		templateVersion: STARTER_TEMPLATE.version
	});
	let files: Record<string, string>;
	try {
		files = readTemplateDirectory(io.templatesDir);
	} catch {
		throw new CommandFailure(1, `cannot read the starter templates in ${io.templatesDir}`);
	}
	return renderProgram(files, context);
}

/** Runs `render` with its arguments (after the subcommand name); prints the program and returns the exit code. */
export async function runRenderCommand(args: string[], io: RenderCommandIo = DEFAULT_IO): Promise<number> {
	try {
		io.writeOut(runRender(parseArguments(args), io));
		return 0;
	} catch (cause) {
		if (cause instanceof CommandFailure) {
			const details = cause.issues.map((issue) => `\n  ${issue.path}: ${issue.message}`).join('');
			io.writeErr(`render: ${cause.message}${details}\n`);
			return cause.exitCode;
		}
		if (cause instanceof TemplateError) {
			io.writeErr(`render: the starter templates could not be rendered: ${cause.message}\n`);
			return 1;
		}
		throw cause;
	}
}

/**
 * The command in the shape scripts/cli.ts registers from scripts/cli-commands/*.ts
 * (`export { renderCommand as command } from '../cli-render'; export const name = 'render';`).
 */
export const renderCommand: CliCommand = {
	summary: 'render a recipe into its Python program with the starter templates (standard@1)',
	usage: 'render --recipe R.json [--template standard@1] [--observation O.json]',
	options: { recipe: { type: 'string' }, template: { type: 'string' }, observation: { type: 'string' } },
	run: (values, io) => {
		const args: string[] = [];
		for (const key of ['recipe', 'template', 'observation'] as const) {
			const value = values[key];
			if (typeof value === 'string') args.push(`--${key}`, value);
		}
		return runRenderCommand(args, { writeOut: io.out, writeErr: io.err, readText: io.readText, templatesDir: STARTER_TEMPLATES_DIR });
	}
};
