/**
 * The Handlebars environment for script templates: an isolated instance (no global
 * helpers or partials) whose only output helpers are `py` and `pyComment`.
 */
import Handlebars from 'handlebars';
import { pyComment, pyLiteral, PyLiteralError } from './python-literal';
import { TemplateError } from './template-error';

/** An isolated Handlebars instance. */
export type TemplateEnvironment = ReturnType<typeof Handlebars.create>;

/**
 * Compile options shared by every script template: `strict` (a missing field
 * throws), `noEscape` (the output is Python, not HTML; quoting is the helpers' job),
 * and only the known helpers, so a template cannot call anything else.
 */
export const TEMPLATE_COMPILE_OPTIONS = {
	strict: true,
	noEscape: true,
	knownHelpers: { py: true, pyComment: true },
	knownHelpersOnly: true
} as const;

/** What Handlebars passes a helper as its last argument (only the parts we read). */
type HelperOptions = { name?: unknown; loc?: { start?: { line?: unknown; column?: unknown } } };

function locationOf(options: unknown): { line: number | null; column: number | null } {
	const start = (options as HelperOptions | undefined)?.loc?.start;
	return {
		line: typeof start?.line === 'number' ? start.line : null,
		column: typeof start?.column === 'number' ? start.column + 1 : null
	};
}

/** Splits Handlebars' helper arguments into the positional values and the options. */
function splitArguments(name: string, args: unknown[]): { value: unknown; where: ReturnType<typeof locationOf> } {
	const options = args[args.length - 1];
	const where = locationOf(options);
	const values = args.slice(0, -1);
	if (values.length !== 1) {
		throw new TemplateError('forbidden_construct', `{{${name}}} takes exactly one value, got ${values.length}`, where);
	}
	const value = values[0];
	if (value === undefined) {
		throw new TemplateError('missing_field', `{{${name}}} was given no value: the field it names is not in the render context`, where);
	}
	return { value, where };
}

function helperPy(...args: unknown[]): string {
	const { value, where } = splitArguments('py', args);
	try {
		return pyLiteral(value);
	} catch (cause) {
		if (cause instanceof PyLiteralError) throw new TemplateError('bad_value', cause.message, where);
		throw cause;
	}
}

function helperPyComment(...args: unknown[]): string {
	const { value, where } = splitArguments('pyComment', args);
	if (typeof value === 'string') return pyComment(value);
	if (typeof value === 'number' || typeof value === 'boolean' || value === null) return pyComment(pyLiteral(value));
	throw new TemplateError('bad_value', '{{pyComment}} needs text (a string, number, boolean or null), not a list or object; use {{py value}} for those', where);
}

/** Creates a fresh, isolated Handlebars instance with only the `py` and `pyComment` helpers. */
export function createTemplateEnvironment(): TemplateEnvironment {
	const env = Handlebars.create();
	// `log` writes to the console and `lookup` reads fields by computed name; neither
	// belongs in a deterministic, statically checked template.
	env.unregisterHelper('log');
	env.unregisterHelper('lookup');
	env.registerHelper('py', helperPy);
	env.registerHelper('pyComment', helperPyComment);
	return env;
}
