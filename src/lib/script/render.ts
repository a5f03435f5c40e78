/**
 * Renders a script template set (sources given as text, keyed by their path under
 * `templates/`) with a render context into the program text.
 */
import { makeErr, makeOk, type Result } from '../calibration/result';
import { createTemplateEnvironment, TEMPLATE_COMPILE_OPTIONS, type TemplateEnvironment } from './handlebars-env';
import type { RenderContext } from './render-context';
import { createStrictView, MissingFieldError } from './strict-context';
import { outlineTemplate, type TemplateOutline, type TemplateReference } from './template-check';
import { TemplateError } from './template-error';

/** The entry template of every set, relative to `templates/`. */
export const ENTRY_TEMPLATE = 'python/calibrate.py.hbs';
const PARTIAL_PATH = /^partials\/(.+)\.hbs$/;

/** A template set that has passed every static check and is ready to render. */
export type CompiledTemplateSet = {
	readonly entry: string;
	readonly partialNames: readonly string[];
	render(context: RenderContext): string;
};

type TemplateFunction = (context: unknown, options?: unknown) => string;

/** Finds where a missing field is read, by its last name segment, to point at a line. */
function locateField(outline: TemplateOutline, error: MissingFieldError): TemplateReference | undefined {
	const key = error.key;
	return (
		outline.paths.find((ref) => ref.name === error.fieldPath) ??
		outline.paths.find((ref) => ref.name.split(/[./]/).includes(key))
	);
}

function toTemplateError(cause: unknown, file: string, outline: TemplateOutline): TemplateError {
	if (cause instanceof TemplateError) return cause.withFile(file);
	if (cause instanceof MissingFieldError) {
		const ref = locateField(outline, cause);
		return new TemplateError(
			'missing_field',
			`${cause.message}; check the field name against the render context contract in templates/README.md`,
			{ file, line: ref?.line ?? null, column: ref?.column ?? null }
		);
	}
	const message = cause instanceof Error ? cause.message : String(cause);
	const lineNumber = (cause as { lineNumber?: unknown }).lineNumber;
	const line = typeof lineNumber === 'number' ? lineNumber : null;
	// A TypeError here means a path went through a null or missing value (e.g.
	// `p.delay.fields` when the step is absent): the template should test it with #if.
	const reason =
		cause instanceof TypeError
			? `the template reads a field of a value that is null or not an object (${message}); guard optional parts with {{#if …}}`
			: `rendering failed: ${message.replace(/ - \d+:\d+$/, '')}`;
	return new TemplateError(cause instanceof TypeError ? 'missing_field' : 'bad_value', reason, { file, line });
}

/** Compiles one file eagerly (Handlebars compiles lazily) and wraps it to name the file in errors. */
function compileFile(env: TemplateEnvironment, file: string, source: string, outline: TemplateOutline): TemplateFunction {
	const options = { ...TEMPLATE_COMPILE_OPTIONS, knownHelpers: { ...TEMPLATE_COMPILE_OPTIONS.knownHelpers } };
	let template: TemplateFunction;
	try {
		env.precompile(source, options);
		template = env.compile(source, options) as TemplateFunction;
	} catch (cause) {
		// The static checks catch what we know of first; this is Handlebars' own verdict.
		const message = cause instanceof Error ? cause.message : String(cause);
		const lineNumber = (cause as { lineNumber?: unknown }).lineNumber;
		throw new TemplateError('syntax', `the template does not compile: ${message.replace(/ - \d+:\d+$/, '')}`, {
			file,
			line: typeof lineNumber === 'number' ? lineNumber : null
		});
	}
	return (context, runtimeOptions) => {
		try {
			return template(context, runtimeOptions);
		} catch (cause) {
			throw toTemplateError(cause, file, outline);
		}
	};
}

/** Rejects partials that include themselves, directly or through others (rendering would never end). */
function checkPartialCycles(outlines: ReadonlyMap<string, TemplateOutline>, partialFiles: ReadonlyMap<string, string>): void {
	const done = new Set<string>();
	const visit = (path: string, trail: string[]): void => {
		if (done.has(path)) return;
		for (const ref of outlines.get(path)?.partials ?? []) {
			const target = partialFiles.get(ref.name);
			if (target === undefined) continue;
			if (trail.includes(target)) {
				const names = [...trail.slice(trail.indexOf(target)), target].map((p) => PARTIAL_PATH.exec(p)?.[1] ?? p);
				throw new TemplateError('forbidden_construct', `partials include each other in a loop (${names.join(' → ')}), so rendering would never end`, {
					file: path,
					line: ref.line,
					column: ref.column
				});
			}
			visit(target, [...trail, target]);
		}
		done.add(path);
	};
	for (const path of outlines.keys()) visit(path, [path]);
}

function compileOrThrow(files: Readonly<Record<string, string>>): CompiledTemplateSet {
	const entrySource = files[ENTRY_TEMPLATE];
	if (entrySource === undefined) {
		throw new TemplateError('missing_entry', `the template set has no entry file templates/${ENTRY_TEMPLATE}`);
	}
	const partialFiles = new Map<string, string>();
	for (const path of Object.keys(files).sort()) {
		const name = PARTIAL_PATH.exec(path)?.[1];
		if (name !== undefined) partialFiles.set(name, path);
	}

	const outlines = new Map<string, TemplateOutline>();
	for (const path of [ENTRY_TEMPLATE, ...partialFiles.values()]) {
		outlines.set(path, outlineTemplate(path, files[path] ?? ''));
	}
	for (const [path, outline] of outlines) {
		for (const ref of outline.partials) {
			if (!partialFiles.has(ref.name)) {
				const available = [...partialFiles.keys()].join(', ') || 'none';
				throw new TemplateError(
					'missing_partial',
					`{{> ${ref.name}}} names a partial that does not exist: add templates/partials/${ref.name}.hbs (available: ${available})`,
					{ file: path, line: ref.line, column: ref.column }
				);
			}
		}
	}

	checkPartialCycles(outlines, partialFiles);

	const env = createTemplateEnvironment();
	for (const [name, path] of partialFiles) {
		const outline = outlines.get(path) ?? { partials: [], paths: [] };
		env.registerPartial(name, compileFile(env, path, files[path] ?? '', outline));
	}
	const entryOutline = outlines.get(ENTRY_TEMPLATE) ?? { partials: [], paths: [] };
	const entry = compileFile(env, ENTRY_TEMPLATE, entrySource, entryOutline);
	return {
		entry: ENTRY_TEMPLATE,
		partialNames: [...partialFiles.keys()],
		render: (context) => entry(createStrictView(context))
	};
}

/** Compiles and checks a template set (e.g. a lead's edited version) without rendering it. */
export function compileTemplateSet(files: Readonly<Record<string, string>>): Result<CompiledTemplateSet, TemplateError> {
	try {
		return makeOk(compileOrThrow(files));
	} catch (cause) {
		if (cause instanceof TemplateError) return makeErr(cause);
		throw cause;
	}
}

/** Renders the program from a template set and a render context; throws TemplateError on any problem. */
export function renderProgram(files: Readonly<Record<string, string>>, context: RenderContext): string {
	return compileOrThrow(files).render(context);
}
