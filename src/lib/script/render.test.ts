import { describe, expect, it } from 'vitest';
import { compileTemplateSet, ENTRY_TEMPLATE, renderProgram } from './render';
import type { RenderContext } from './render-context';
import { runPythonJson } from './python-test-harness';
import { TemplateError } from './template-error';

function makeContext(overrides: Partial<RenderContext['p']> = {}): RenderContext {
	return {
		header: {
			title: 'Demo',
			recipe_id: '00000000-0000-4000-8000-000000000001',
			recipe_version: 3,
			template_name: 'standard',
			template_version: 1,
			params_sha256: 'e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855'
		},
		p: {
			title: 'Demo',
			notes: '',
			spectral_window_id: 0,
			field_roles: { CAL: ['flux_calibrator'], T1: ['target'] },
			targets: [{ field: 'T1', gain_calibrator: 'CAL', interpolation: 'linear' }],
			reference_antenna: 'A01',
			reference_fallbacks: ['A02'],
			clean_channels: [[10, 20]],
			excluded_channels: [],
			flux_models: {},
			steps: ['gain', 'apply'],
			delay: null,
			bandpass_prep: null,
			bandpass: null,
			gain: { fields: ['CAL'], interval: { mode: 'scan', seconds: null }, solve_for: 'phase', min_snr: 3 },
			flux_bootstrap: null,
			apply: { fields: ['T1'] },
			verify: null,
			...overrides
		}
	};
}

function withEntry(entry: string, partials: Record<string, string> = {}): Record<string, string> {
	const files: Record<string, string> = { [ENTRY_TEMPLATE]: entry };
	for (const [name, source] of Object.entries(partials)) files[`partials/${name}.hbs`] = source;
	return files;
}

function catchTemplateError(run: () => unknown): TemplateError {
	try {
		run();
	} catch (error) {
		if (error instanceof TemplateError) return error;
		throw error;
	}
	throw new Error('expected a TemplateError, but rendering succeeded');
}

function compileError(files: Record<string, string>): TemplateError {
	const result = compileTemplateSet(files);
	if (result.ok) throw new Error('expected the template set to be rejected');
	return result.error;
}

describe('renderProgram', () => {
	it('renders the entry with partials, keeping a standalone partial’s indentation', () => {
		// Handlebars docs ("Partials", whitespace control): a standalone partial is indented
		// by the whitespace before its tag on every line it outputs.
		const files = withEntry('TITLE = {{py p.title}}\nif True:\n    {{> body}}\nDONE = 1\n', {
			body: '{{#each p.steps}}\nSTEP_{{py @index}} = {{py this}}\n{{/each}}\n'
		});
		expect(renderProgram(files, makeContext())).toBe(
			'TITLE = "Demo"\nif True:\n    STEP_0 = "gain"\n    STEP_1 = "apply"\nDONE = 1\n'
		);
	});

	it('gives byte-identical output for the same inputs, whatever the order of the files', () => {
		const entry = '# {{pyComment header.title}}\n{{> a}}{{> b}}';
		const partials = { a: 'A = {{py p.field_roles}}\n', b: 'B = {{py p.targets}}\n' };
		const files = withEntry(entry, partials);
		const reversed = Object.fromEntries(Object.entries(files).reverse());
		const first = renderProgram(files, makeContext());
		expect(renderProgram(files, makeContext())).toBe(first);
		expect(renderProgram(reversed, makeContext())).toBe(first);
		const compiled = compileTemplateSet(files);
		expect(compiled.ok && compiled.value.render(makeContext()) === compiled.value.render(makeContext())).toBe(true);
	});

	it('throws a missing_field error naming the file, line and field for a misspelt field', () => {
		const files = withEntry('A = 1\n{{> body}}', { body: 'X = 1\nY = {{py p.reference_antena}}\n' });
		const error = catchTemplateError(() => renderProgram(files, makeContext()));
		expect(error.kind).toBe('missing_field');
		expect(error.file).toBe('partials/body.hbs');
		expect(error.line).toBe(2);
		expect(error.message).toMatch(/templates\/partials\/body\.hbs line 2.*"p\.reference_antena"/);
	});

	it('treats a missing field in an #if condition or inside #each as an error, not as false', () => {
		const inIf = catchTemplateError(() => renderProgram(withEntry('{{#if p.dleay}}x{{/if}}'), makeContext()));
		expect(inIf.kind).toBe('missing_field');
		expect(inIf.message).toContain('"p.dleay"');
		const inEach = catchTemplateError(() =>
			renderProgram(withEntry('{{#each p.targets}}\n{{py gain_calibrater}}\n{{/each}}'), makeContext())
		);
		expect(inEach.message).toContain('"p.targets[0].gain_calibrater"');
		expect(inEach.line).toBe(2);
	});

	it('reports reading through a null step as a missing field with advice to guard it', () => {
		const error = catchTemplateError(() => renderProgram(withEntry('{{py p.delay.fields}}'), makeContext()));
		expect(error.kind).toBe('missing_field');
		expect(error.message).toMatch(/null.*\{\{#if/);
	});

	it('renders optional steps only when present', () => {
		const files = withEntry('{{#if p.delay}}DELAY = {{py p.delay.fields}}\n{{else}}DELAY = None\n{{/if}}');
		expect(renderProgram(files, makeContext())).toBe('DELAY = None\n');
		const delay: RenderContext['p']['delay'] = { fields: ['CAL'], interval: { mode: 'seconds', seconds: 60 }, min_snr: 5, search_window_ns: 200 };
		expect(renderProgram(files, makeContext({ delay }))).toBe('DELAY = ["CAL"]\n');
	});

	it('supports else-if chains, #each over an object with @key, #with and comments', () => {
		const files = withEntry(
			'{{!-- a comment --}}\n{{#if p.delay}}\nD = 1\n{{else if p.gain}}\nG = {{py p.gain.solve_for}}\n{{/if}}\n{{#each p.field_roles}}\nR[{{py @key}}] = {{py this}}\n{{/each}}\n{{#with p.gain}}\nS = {{py min_snr}}\n{{/with}}\n'
		);
		expect(renderProgram(files, makeContext())).toBe('G = "phase"\nR["CAL"] = ["flux_calibrator"]\nR["T1"] = ["target"]\nS = 3\n');
	});

	it('rejects a value that has no Python literal (NaN) with the file and line', () => {
		const context = makeContext({ spectral_window_id: Number.NaN });
		const error = catchTemplateError(() => renderProgram(withEntry('\nSPW = {{py p.spectral_window_id}}\n'), context));
		expect(error.kind).toBe('bad_value');
		expect(error.line).toBe(2);
		expect(error.message).toMatch(/NaN is not a finite number/);
	});

	it('keeps hostile user text out of the code: the program is only the template’s statements', () => {
		const hostile = 'x"""\n__import__("os").system("echo pwned")\n#\u2028\r\0{{py p.title}}\'\'\'\\';
		const files = withEntry('# {{pyComment header.title}}\n# {{pyComment p.notes}}\nTITLE = {{py p.title}}\nROLES = {{py p.field_roles}}\n');
		const context = makeContext({ title: hostile, notes: hostile, field_roles: { [hostile]: ['target'] } });
		context.header.title = hostile;
		const program = renderProgram(files, context);
		const script = String.raw`
import ast, json, sys
data = json.load(open(sys.argv[1], encoding="utf-8"))
tree = ast.parse(data["program"].encode("utf-8"))
names = [t.id for s in tree.body for t in s.targets]
values = [ast.literal_eval(s.value) for s in tree.body]
print(json.dumps({"names": names, "title_ok": values[0] == data["hostile"], "roles_ok": values[1] == {data["hostile"]: ["target"]}, "lines": len(data["program"].splitlines())}))
`;
		expect(runPythonJson(script, { program, hostile })).toEqual({ names: ['TITLE', 'ROLES'], title_ok: true, roles_ok: true, lines: 4 });
	});
});

describe('compileTemplateSet', () => {
	it('accepts a valid set and lists its partials', () => {
		const result = compileTemplateSet(withEntry('{{> b}}{{> a}}', { a: 'A', b: 'B' }));
		expect(result.ok && result.value.partialNames).toEqual(['a', 'b']);
	});

	it('rejects triple-stash and {{& }} raw output at compile time with a clear message', () => {
		for (const source of ['X = 1\n{{{p.title}}}', 'X = 1\n{{& p.title}}', 'X = 1\n{{{py p.title}}}']) {
			const error = compileError(withEntry(source));
			expect(error.kind).toBe('raw_output');
			expect(error.line).toBe(2);
			expect(error.message).toMatch(/raw output .* is not allowed.*\{\{py value\}\}/);
		}
	});

	it('rejects bare output of a value, including @index, because it would be unquoted', () => {
		for (const source of ['{{p.title}}', '{{#each p.steps}}{{@index}}{{/each}}', '{{this}}']) {
			const error = compileError(withEntry(source));
			expect(error.kind).toBe('unquoted_output');
			expect(error.message).toMatch(/write \{\{py /);
		}
	});

	it('rejects unknown helpers, including the built-in log and lookup', () => {
		for (const source of ['{{shout p.title}}', '{{log p.title}}', '{{#lookup p "title"}}x{{/lookup}}', '{{{{raw}}}}{{p.title}}{{{{/raw}}}}']) {
			const error = compileError(withEntry(source));
			expect(error.kind).toBe('unknown_helper');
		}
		expect(compileError(withEntry('{{py (lookup p "title")}}')).kind).toBe('forbidden_construct');
	});

	it('rejects py with no value or with two values, and with name=value options', () => {
		for (const source of ['{{py}}', '{{py p.title p.notes}}', '{{py p.title x=1}}']) {
			expect(compileError(withEntry(source)).kind).toBe('forbidden_construct');
		}
	});

	it('rejects a missing partial, naming the file, line and the partials that exist', () => {
		const error = compileError(withEntry('A = 1\n\n{{> solverz}}', { solvers: 'S = 1' }));
		expect(error.kind).toBe('missing_partial');
		expect(error.line).toBe(3);
		expect(error.message).toMatch(/templates\/python\/calibrate\.py\.hbs line 3.*solverz.*available: solvers/);
	});

	it('rejects dynamic partials, partial blocks and decorators', () => {
		for (const source of ['{{> (p.title)}}', '{{#> a}}x{{/a}}', '{{* deco}}', '{{#py p.title}}x{{/py}}']) {
			expect(compileError(withEntry(source, { a: 'A' })).kind).toBe('forbidden_construct');
		}
	});

	it('rejects partials that include each other in a loop', () => {
		const error = compileError(withEntry('{{> a}}', { a: 'A\n{{> b}}', b: '{{> a}}' }));
		expect(error.kind).toBe('forbidden_construct');
		expect(error.message).toMatch(/loop \(a → b → a\)/);
		expect(compileError(withEntry('{{> self}}', { self: '{{> self}}' })).message).toMatch(/self → self/);
	});

	it('reports a syntax error with the file and the line Handlebars gives', () => {
		const error = compileError(withEntry('ok\n{{> a}}', { a: 'one\ntwo\n{{#if p.title}}\nunclosed' }));
		expect(error.kind).toBe('syntax');
		expect(error.file).toBe('partials/a.hbs');
		expect(error.line).not.toBeNull();
		expect(error.message).toMatch(/^templates\/partials\/a\.hbs line \d+: the template is not valid Handlebars/);
		const mismatched = compileError(withEntry('x\n{{#if p.title}}\n{{/each}}'));
		expect(mismatched.kind).toBe('syntax');
		expect(mismatched.message).toMatch(/doesn't match/);
	});

	it('rejects a set without the entry template', () => {
		const error = compileError({ 'partials/a.hbs': 'A' });
		expect(error.kind).toBe('missing_entry');
		expect(error.message).toContain('templates/python/calibrate.py.hbs');
	});
});
