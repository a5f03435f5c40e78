import { describe, expect, it } from 'vitest';
import { createStrictView, MissingFieldError } from './strict-context';

describe('createStrictView', () => {
	const context = { p: { title: 'T', steps: ['gain'], delay: null, roles: { CAL: ['target'] } } };

	it('reads present fields, including null ones, as they are', () => {
		const view = createStrictView(context);
		expect(view.p.title).toBe('T');
		expect(view.p.delay).toBeNull();
		expect(view.p.steps[0]).toBe('gain');
		expect(Object.keys(view.p.roles)).toEqual(['CAL']);
		expect(Array.isArray(view.p.steps)).toBe(true);
	});

	it('throws MissingFieldError with the full path for an absent field or index', () => {
		const view = createStrictView(context) as unknown as { p: Record<string, unknown> & { steps: string[] } };
		expect(() => view.p.titel).toThrow(MissingFieldError);
		expect(() => view.p.titel).toThrow('"p.titel"');
		expect(() => view.p.steps[3]).toThrow('"p.steps[3]"');
	});

	it('refuses writes and deletes, so a template cannot change the context', () => {
		const view = createStrictView(context) as unknown as { p: Record<string, unknown> };
		expect(() => {
			view.p.title = 'changed';
		}).toThrow(/read-only/);
		expect(() => delete view.p.title).toThrow(/read-only/);
		expect(context.p.title).toBe('T');
	});
});
