/**
 * Canonical JSON: the one text form of a JSON value that Phasewright hashes.
 * Object keys are sorted by UTF-16 code units (as in RFC 8785, JSON Canonicalization
 * Scheme), there is no whitespace, and strings and numbers are written as
 * JSON.stringify writes them (the serialisation RFC 8785 adopts). Object members
 * whose value is `undefined` are left out, as JSON.stringify does, so an absent
 * optional field and one set to undefined hash the same.
 */

/** A value that has no canonical JSON form (NaN, a function, a cycle…), with where it sits. */
export class CanonicalJsonError extends Error {
	constructor(path: string, problem: string) {
		super(`Cannot write the value at ${path} as canonical JSON: ${problem}`);
		this.name = 'CanonicalJsonError';
	}
}

function compareCodeUnits(a: string, b: string): number {
	// Plain < on JS strings compares UTF-16 code units, which is RFC 8785's order.
	return a < b ? -1 : a > b ? 1 : 0;
}

function writeCanonical(value: unknown, path: string, open: Set<object>): string {
	if (value === null) return 'null';
	switch (typeof value) {
		case 'string':
			return JSON.stringify(value);
		case 'boolean':
			return value ? 'true' : 'false';
		case 'number':
			if (!Number.isFinite(value)) throw new CanonicalJsonError(path, `${String(value)} is not a finite number`);
			return JSON.stringify(value);
		case 'object':
			break;
		default:
			throw new CanonicalJsonError(path, `${value === undefined ? 'undefined' : `a ${typeof value}`} is not a JSON value`);
	}
	if (open.has(value)) throw new CanonicalJsonError(path, 'the value contains itself (a cycle)');
	open.add(value);
	try {
		if (Array.isArray(value)) {
			return `[${value.map((item, i) => writeCanonical(item, `${path}[${i}]`, open)).join(',')}]`;
		}
		const proto: unknown = Object.getPrototypeOf(value);
		if (proto !== Object.prototype && proto !== null) {
			throw new CanonicalJsonError(path, 'only plain objects and arrays are JSON values');
		}
		const record = value as Record<string, unknown>;
		const members = Object.keys(record)
			.filter((key) => record[key] !== undefined)
			.sort(compareCodeUnits)
			.map((key) => `${JSON.stringify(key)}:${writeCanonical(record[key], `${path}.${key}`, open)}`);
		return `{${members.join(',')}}`;
	} finally {
		open.delete(value);
	}
}

/** Writes a JSON value in canonical form: sorted keys, no whitespace. */
export function canonicalJson(value: unknown): string {
	return writeCanonical(value, '$', new Set());
}
