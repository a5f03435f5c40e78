import type { z } from 'zod';
import type { InputIssue } from './result';

/** Render a path as `$.scans[3].field_id`. */
export function formatPath(path: readonly PropertyKey[]): string {
	let out = '$';
	for (const key of path) {
		if (typeof key === 'number') out += `[${key}]`;
		else if (typeof key === 'string' && /^[A-Za-z_][A-Za-z0-9_]*$/.test(key)) out += `.${key}`;
		else out += `[${JSON.stringify(String(key))}]`;
	}
	return out;
}

/** A short description of a JSON value for "found …" messages. */
export function describeValue(value: unknown): string {
	if (value === undefined) return 'nothing (the key is missing)';
	if (value === null) return 'null';
	if (Array.isArray(value)) return `an array of ${value.length} item${value.length === 1 ? '' : 's'}`;
	if (typeof value === 'string') {
		const shown = value.length > 40 ? `${value.slice(0, 40)}…` : value;
		return `the text ${JSON.stringify(shown)}`;
	}
	if (typeof value === 'number') return Number.isInteger(value) ? `the integer ${value}` : `the number ${value}`;
	if (typeof value === 'boolean') return `${value}`;
	if (typeof value === 'object') return 'an object';
	return typeof value;
}

const TYPE_NAMES: Record<string, string> = {
	int: 'an integer',
	number: 'a number',
	string: 'text',
	object: 'an object',
	array: 'an array',
	boolean: 'true or false'
};

function describeIssue(issue: z.core.$ZodIssue): string {
	const found = describeValue(issue.input);
	switch (issue.code) {
		case 'invalid_type':
			return `expected ${TYPE_NAMES[issue.expected] ?? issue.expected}, found ${found}`;
		case 'invalid_value':
			return `expected one of ${issue.values.map((v) => JSON.stringify(v)).join(', ')}, found ${found}`;
		case 'invalid_union':
			{
				const extra = issue as { discriminator?: unknown; options?: unknown };
				if (typeof extra.discriminator === 'string' && Array.isArray(extra.options)) {
					const options = extra.options.map((v: unknown) => JSON.stringify(v)).join(', ');
					const input = issue.input;
					const value = input && typeof input === 'object' ? (input as Record<string, unknown>)[extra.discriminator] : undefined;
					return `expected "${extra.discriminator}" to be one of ${options}, found ${describeValue(value)}`;
				}
			}
			return `expected one of the allowed shapes, found ${found}`;
		case 'too_small': {
			const bound = `${issue.inclusive ? 'at least' : 'more than'} ${issue.minimum}`;
			if (issue.origin === 'string') return `expected text of ${bound} characters, found ${found}`;
			if (issue.origin === 'array') return `expected ${bound} items, found ${found}`;
			return `expected a value ${bound}, found ${found}`;
		}
		case 'too_big': {
			const bound = `${issue.inclusive ? 'at most' : 'less than'} ${issue.maximum}`;
			if (issue.origin === 'string') return `expected text of ${bound} characters, found text of ${String(issue.input).length}`;
			if (issue.origin === 'array') return `expected ${bound} items, found ${found}`;
			return `expected a value ${bound}, found ${found}`;
		}
		case 'unrecognized_keys':
			return `unknown key${issue.keys.length === 1 ? '' : 's'} ${issue.keys.map((k) => JSON.stringify(k)).join(', ')}: remove or rename ${issue.keys.length === 1 ? 'it' : 'them'}`;
		case 'invalid_format':
			return `expected ${issue.format === 'datetime' ? 'an ISO 8601 UTC time such as "2026-03-14T20:00:00Z"' : issue.format}, found ${found}`;
		default:
			return `${issue.message}, found ${found}`;
	}
}

/** Turn zod issues into `{ path, message }` with "expected … found …" wording. */
export function convertZodIssues(issues: readonly z.core.$ZodIssue[], prefix: readonly PropertyKey[] = []): InputIssue[] {
	return issues.map((issue) => {
		const path = [...prefix, ...issue.path];
		// For a bad discriminator zod points at the object; point at the discriminator key itself.
		if (issue.code === 'invalid_union' && 'discriminator' in issue && typeof issue.discriminator === 'string') {
			if (path[path.length - 1] !== issue.discriminator) path.push(issue.discriminator);
		}
		return { path: formatPath(path), message: describeIssue(issue) };
	});
}
