import { describe, expect, it } from 'vitest';
import { outlineTemplate } from './template-check';
import { TemplateError } from './template-error';

describe('outlineTemplate', () => {
	it('lists the partials and context paths a template uses, with 1-based lines and columns', () => {
		const outline = outlineTemplate('python/x.hbs', 'A = {{py p.title}}\n{{#if p.delay}}\n  {{> delay}}\n{{/if}}\n');
		expect(outline.partials).toEqual([{ name: 'delay', line: 3, column: 3 }]);
		expect(outline.paths).toEqual([
			{ name: 'p.title', line: 1, column: 10 },
			{ name: 'p.delay', line: 2, column: 7 }
		]);
	});

	it('accepts comments, whitespace control and string literals', () => {
		expect(() => outlineTemplate('a.hbs', '{{!-- note --}}\n{{~py "fixed"~}}\n# {{pyComment p.notes}}')).not.toThrow();
	});

	it('throws a TemplateError carrying the file and position of the first offending statement', () => {
		let caught: unknown;
		try {
			outlineTemplate('partials/x.hbs', 'ok\nstill ok {{py p.a}}\n   {{p.b}}');
		} catch (error) {
			caught = error;
		}
		expect(caught).toBeInstanceOf(TemplateError);
		expect(caught).toMatchObject({ kind: 'unquoted_output', file: 'partials/x.hbs', line: 3, column: 4 });
	});
});
