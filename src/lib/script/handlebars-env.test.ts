import Handlebars from 'handlebars';
import { describe, expect, it } from 'vitest';
import { createTemplateEnvironment, TEMPLATE_COMPILE_OPTIONS } from './handlebars-env';

function compileWith(env: ReturnType<typeof createTemplateEnvironment>, source: string): (context: unknown) => string {
	return env.compile(source, { ...TEMPLATE_COMPILE_OPTIONS, knownHelpers: { ...TEMPLATE_COMPILE_OPTIONS.knownHelpers } });
}

describe('createTemplateEnvironment', () => {
	it('has py and pyComment, the block helpers, and neither log nor lookup', () => {
		const env = createTemplateEnvironment();
		// Handlebars 4 built-ins: blockHelperMissing, each, helperMissing, if, unless, log, lookup, with.
		expect(Object.keys(env.helpers).sort()).toEqual(
			['blockHelperMissing', 'each', 'helperMissing', 'if', 'py', 'pyComment', 'unless', 'with'].sort()
		);
	});

	it('is isolated from the global Handlebars instance and from other environments', () => {
		Handlebars.registerHelper('leakedHelper', () => 'leak');
		Handlebars.registerPartial('leakedPartial', 'leak');
		try {
			const env = createTemplateEnvironment();
			expect(env.helpers).not.toHaveProperty('leakedHelper');
			expect(env.partials).not.toHaveProperty('leakedPartial');
			env.registerPartial('mine', 'x');
			expect(createTemplateEnvironment().partials).not.toHaveProperty('mine');
		} finally {
			Handlebars.unregisterHelper('leakedHelper');
			Handlebars.unregisterPartial('leakedPartial');
		}
	});

	it('does not HTML-escape: py output reaches the program as Python, not as &quot;', () => {
		const env = createTemplateEnvironment();
		// Handlebars escapes & < > " ' ` = in {{ }} unless noEscape is set (Handlebars docs, "HTML escaping").
		expect(compileWith(env, 'X = {{py v}}')({ v: 'a&b<c>"d"=' })).toBe('X = "a&b<c>\\"d\\"="');
	});

	it('pyComment accepts text and scalars but refuses lists and objects', () => {
		const env = createTemplateEnvironment();
		const render = compileWith(env, '# {{pyComment v}}');
		expect(render({ v: 'a\nb' })).toBe('# a\\nb');
		expect(render({ v: 2.5 })).toBe('# 2.5');
		expect(render({ v: null })).toBe('# None');
		expect(() => render({ v: ['x'] })).toThrow(/pyComment.*needs text/);
	});

	it('py refuses a missing value instead of printing nothing', () => {
		const env = createTemplateEnvironment();
		// Handlebars' strict mode does not cover helper arguments, so the helper checks.
		expect(() => compileWith(env, 'X = {{py v}}')({})).toThrow(/was given no value/);
	});
});
