/**
 * Static checks on a template's syntax tree, run before anything is compiled: the
 * app's rule is that nothing reaches the program except through `py` / `pyComment`,
 * so every output statement must be one of those two helpers with one argument.
 */
import Handlebars from 'handlebars';
import { TemplateError } from './template-error';

/** The helpers that write output, and the block helpers templates may use. */
export const OUTPUT_HELPERS: readonly string[] = ['py', 'pyComment'];
export const BLOCK_HELPERS: readonly string[] = ['if', 'unless', 'each', 'with'];

/** A use of a name in a template: a partial it includes or a context path it reads. */
export type TemplateReference = { name: string; line: number; column: number };

/** What a template refers to, for the cross-file checks and for error locations. */
export type TemplateOutline = { partials: TemplateReference[]; paths: TemplateReference[] };

type Node = hbs.AST.Node;

function at(node: Node): { line: number; column: number } {
	return { line: node.loc.start.line, column: node.loc.start.column + 1 };
}

function describeOutput(node: hbs.AST.MustacheStatement): string {
	const path = node.path;
	return path.type === 'PathExpression' ? (path as hbs.AST.PathExpression).original : 'a literal';
}

/** Parses a template, raising a TemplateError at the line Handlebars reports. */
export function parseTemplate(file: string, source: string): hbs.AST.Program {
	try {
		return Handlebars.parse(source);
	} catch (cause) {
		const text = cause instanceof Error ? cause.message : String(cause);
		const lineNumber = (cause as { lineNumber?: unknown }).lineNumber;
		const reported = /line (\d+)/.exec(text)?.[1];
		const line = typeof lineNumber === 'number' ? lineNumber : reported !== undefined ? Number(reported) : null;
		const detail = text.replace(/ - \d+:\d+$/, '').replace(/^Parse error on line \d+:\n/, '');
		throw new TemplateError('syntax', `the template is not valid Handlebars: ${detail}`, { file, line });
	}
}

class OutlineWalker {
	readonly outline: TemplateOutline = { partials: [], paths: [] };
	constructor(private readonly file: string) {}

	private fail(kind: ConstructorParameters<typeof TemplateError>[0], reason: string, node: Node): never {
		throw new TemplateError(kind, reason, { file: this.file, ...at(node) });
	}

	program(program: hbs.AST.Program | undefined): void {
		for (const statement of program?.body ?? []) this.statement(statement);
	}

	private statement(node: Node): void {
		switch (node.type) {
			case 'ContentStatement':
			case 'CommentStatement':
				return;
			case 'MustacheStatement':
				return this.mustache(node as hbs.AST.MustacheStatement);
			case 'BlockStatement':
				return this.block(node as hbs.AST.BlockStatement);
			case 'PartialStatement':
				return this.partial(node as hbs.AST.PartialStatement);
			case 'PartialBlockStatement':
				return this.fail('forbidden_construct', 'partial blocks ({{#> name}}…{{/name}}) are not supported; include partials with {{> name}}', node);
			default:
				return this.fail('forbidden_construct', `decorators and other ${node.type} constructs are not supported in script templates`, node);
		}
	}

	private mustache(node: hbs.AST.MustacheStatement): void {
		if (!node.escaped) {
			this.fail(
				'raw_output',
				`raw output ({{{…}}} or {{& …}}) of ${describeOutput(node)} is not allowed: program text must go through {{py value}} (a Python literal) or # {{pyComment text}} (a one-line comment)`,
				node
			);
		}
		const name = describeOutput(node);
		if (!OUTPUT_HELPERS.includes(name)) {
			const known = node.params.length > 0 || node.hash !== undefined;
			this.fail(
				known ? 'unknown_helper' : 'unquoted_output',
				known
					? `unknown helper "${name}": script templates may only call py and pyComment (and the blocks ${BLOCK_HELPERS.join(', ')})`
					: `{{${name}}} would write a value into the program unquoted: write {{py ${name}}} for a Python literal or # {{pyComment ${name}}} for comment text`,
				node
			);
		}
		if (node.params.length !== 1 || (node.hash?.pairs.length ?? 0) > 0) {
			this.fail('forbidden_construct', `{{${name}}} takes exactly one value and no name=value options, e.g. {{${name} p.title}}`, node);
		}
		this.expressions(node.params);
	}

	private block(node: hbs.AST.BlockStatement): void {
		const name = node.path.original;
		if (!BLOCK_HELPERS.includes(name)) {
			this.fail(
				OUTPUT_HELPERS.includes(name) ? 'forbidden_construct' : 'unknown_helper',
				`{{#${name}}} is not an allowed block: script templates may use ${BLOCK_HELPERS.map((b) => `{{#${b}}}`).join(', ')}`,
				node
			);
		}
		this.expressions(node.params);
		this.hash(node.hash);
		this.program(node.program);
		this.program(node.inverse);
	}

	private partial(node: hbs.AST.PartialStatement): void {
		if (node.name.type !== 'PathExpression') {
			this.fail('forbidden_construct', 'dynamic partial names ({{> (…)}}) are not allowed: name the partial, e.g. {{> solvers}}', node);
		}
		this.outline.partials.push({ name: (node.name as hbs.AST.PathExpression).original, ...at(node) });
		this.expressions(node.params);
		this.hash(node.hash);
	}

	private hash(hash: hbs.AST.Hash | undefined): void {
		for (const pair of hash?.pairs ?? []) this.expressions([pair.value]);
	}

	private expressions(list: hbs.AST.Expression[]): void {
		for (const expr of list) {
			if (expr.type === 'SubExpression') {
				this.fail('forbidden_construct', 'sub-expressions ((helper …)) are not allowed in script templates: read fields of the render context directly', expr);
			}
			if (expr.type === 'PathExpression') {
				const path = expr as hbs.AST.PathExpression;
				this.outline.paths.push({ name: path.original, ...at(expr) });
			}
		}
	}
}

/** Checks one template's syntax and output rule; returns the partials and paths it uses. */
export function outlineTemplate(file: string, source: string): TemplateOutline {
	const walker = new OutlineWalker(file);
	walker.program(parseTemplate(file, source));
	return walker.outline;
}
