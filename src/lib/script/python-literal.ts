/**
 * Python literal emitter: turns JSON-like values into Python source text that
 * `ast.literal_eval` reads back exactly, and user text into the body of one `#`
 * comment line. These are the only ways user text reaches a rendered program.
 *
 * Choices (documented here because reviewers diff the output):
 * - Strings use double quotes. Printable characters stay as they are (the program is
 *   UTF-8); everything a reader could not see or that could end a line or reorder the
 *   display is escaped (see ESCAPED_RANGES): C0/C1 controls, DEL, U+2028/U+2029, bidi
 *   controls, zero-width characters, the BOM, non-ASCII spaces, private-use code points,
 *   noncharacters, and lone surrogates (as `\udXXX`, which Python keeps as the same lone
 *   surrogate).
 * - JS numbers are all doubles. Integral values in the safe-integer range
 *   (|v| <= 2**53 - 1) are written as Python ints, because every such int converts
 *   to exactly that double and reads as an int to a reviewer. Larger integral values
 *   (2**53 + 1 is already unrepresentable in JS) and all fractional values are written
 *   as Python floats in the shortest form that round-trips through float(); -0 is
 *   written `-0.0` to keep its sign. NaN and ±Infinity are rejected.
 * - Arrays become lists, plain objects dicts in the object's own key order (JS orders
 *   integer-like keys first), null None, booleans True/False. Anything else
 *   (undefined, functions, symbols, Maps, Dates, class instances, cycles) is rejected.
 */

/** A value that cannot be written as a Python literal; `path` says where it sits. */
export class PyLiteralError extends Error {
	readonly path: string;
	constructor(path: string, problem: string) {
		super(`Cannot write the value at ${path} as a Python literal: ${problem}`);
		this.name = 'PyLiteralError';
		this.path = path;
	}
}

/*
 * Code points written as escapes, as a fixed table rather than Unicode property
 * classes: property classes change with the runtime's Unicode version, and the same
 * recipe must render to the same bytes on every Node release. The table covers the
 * controls (C0, DEL, C1), every space but U+0020, invisible joiners and fillers, bidi
 * marks/embeddings/isolates, line and paragraph separators, the BOM, interlinear
 * annotation and other specials, tag characters, format controls of later planes,
 * private use, noncharacters, and surrogates (only lone ones reach this check).
 */
const ESCAPED_RANGES: readonly (readonly [number, number])[] = [
	[0x0000, 0x001f], [0x007f, 0x00a0], [0x00ad, 0x00ad], [0x034f, 0x034f], [0x0600, 0x0605],
	[0x061c, 0x061c], [0x06dd, 0x06dd], [0x070f, 0x070f], [0x0890, 0x0891], [0x08e2, 0x08e2],
	[0x115f, 0x1160], [0x1680, 0x1680], [0x17b4, 0x17b5], [0x180b, 0x180f], [0x2000, 0x200f],
	[0x2028, 0x202f], [0x205f, 0x206f], [0x3000, 0x3000], [0x3164, 0x3164], [0xd800, 0xf8ff],
	[0xfdd0, 0xfdef], [0xfeff, 0xfeff], [0xffa0, 0xffa0], [0xfff0, 0xfffb], [0xfffe, 0xffff],
	[0x110bd, 0x110bd], [0x110cd, 0x110cd], [0x13430, 0x1343f], [0x1bca0, 0x1bca3], [0x1d173, 0x1d17a],
	[0xe0000, 0xe007f], [0xf0000, 0x10ffff]
];

function isEscaped(codePoint: number): boolean {
	if (codePoint >= 0x20 && codePoint < 0x7f) return false;
	for (const [lo, hi] of ESCAPED_RANGES) {
		if (codePoint < lo) return false;
		if (codePoint <= hi) return true;
	}
	return false;
}

/** Whether a code point is written as an escape by pyStr and pyComment (exported for tests). */
export function isEscapedCodePoint(codePoint: number): boolean {
	return isEscaped(codePoint) || (codePoint & 0xfffe) === 0xfffe;
}

const NAMED_ESCAPES: Readonly<Record<string, string>> = {
	'\n': '\\n',
	'\r': '\\r',
	'\t': '\\t',
	'\\': '\\\\'
};

function hex(codePoint: number, width: number): string {
	return codePoint.toString(16).padStart(width, '0');
}

/** Python escape for one code point: \xHH, \uHHHH or \UHHHHHHHH. */
function escapeCodePoint(codePoint: number): string {
	if (codePoint < 0x100) return `\\x${hex(codePoint, 2)}`;
	if (codePoint < 0x10000) return `\\u${hex(codePoint, 4)}`;
	return `\\U${hex(codePoint, 8)}`;
}

/** Escapes one code point (as a string of 1–2 UTF-16 units) for a Python string body. */
function escapeChar(ch: string, quote: string): string {
	const named = NAMED_ESCAPES[ch];
	if (named !== undefined) return named;
	if (ch === quote) return `\\${quote}`;
	const codePoint = ch.codePointAt(0) ?? 0;
	if (isEscapedCodePoint(codePoint)) return escapeCodePoint(codePoint);
	return ch;
}

/** Writes a JS string as a double-quoted Python string literal on one line. */
export function pyStr(text: string): string {
	let out = '"';
	// for..of walks code points; a lone surrogate comes out as a single unit.
	for (const ch of text) out += escapeChar(ch, '"');
	return `${out}"`;
}

/** Writes a finite JS number as a Python int or float literal (see the module note). */
export function pyNumber(value: number, path = '$'): string {
	if (!Number.isFinite(value)) {
		throw new PyLiteralError(path, `${String(value)} is not a finite number; Python literals have no NaN or infinity`);
	}
	if (Object.is(value, -0)) return '-0.0';
	if (Number.isSafeInteger(value)) return String(value);
	// Number#toString gives the shortest decimal that reads back as the same double
	// (ECMA-262 Number::toString), which is also what Python's float() needs.
	const text = String(value);
	return /[.e]/.test(text) ? text : `${text}.0`;
}

function isPlainObject(value: object): value is Record<string, unknown> {
	const proto: unknown = Object.getPrototypeOf(value);
	return proto === Object.prototype || proto === null;
}

function keyPath(path: string, key: string): string {
	return /^[A-Za-z_][A-Za-z0-9_]*$/.test(key) ? `${path}.${key}` : `${path}[${JSON.stringify(key)}]`;
}

function writeValue(value: unknown, path: string, open: Set<object>): string {
	if (value === null) return 'None';
	switch (typeof value) {
		case 'string':
			return pyStr(value);
		case 'number':
			return pyNumber(value, path);
		case 'boolean':
			return value ? 'True' : 'False';
		case 'bigint':
			return value.toString();
		case 'object':
			break;
		default:
			throw new PyLiteralError(path, `${value === undefined ? 'undefined' : `a ${typeof value}`} is not a JSON value`);
	}
	if (open.has(value)) throw new PyLiteralError(path, 'the value contains itself (a cycle)');
	open.add(value);
	try {
		if (Array.isArray(value)) {
			return `[${value.map((item, i) => writeValue(item, `${path}[${i}]`, open)).join(', ')}]`;
		}
		if (!isPlainObject(value)) {
			const kind = value.constructor?.name ?? 'unknown';
			throw new PyLiteralError(path, `a ${kind} object is not a JSON value; pass plain objects and arrays`);
		}
		const entries = Object.keys(value).map(
			(key) => `${pyStr(key)}: ${writeValue(value[key], keyPath(path, key), open)}`
		);
		return `{${entries.join(', ')}}`;
	} finally {
		open.delete(value);
	}
}

/** Writes any JSON value as a one-line Python literal that `ast.literal_eval` reads back exactly. */
export function pyLiteral(value: unknown): string {
	return writeValue(value, '$', new Set());
}

// Python reads an encoding declaration from a comment on line 1 or 2 (PEP 263,
// regex `^[ \t\f]*#.*?coding[:=]`); a user's title saying "coding: utf-7" there would
// change how the whole file decodes. Escaping the separator keeps the text readable.
const ENCODING_DECLARATION = /(coding)([:=])/gi;

/**
 * Writes user text as the body of a single `#` comment line: backslashes are doubled
 * and every invisible or line-ending character becomes a visible escape, so the text
 * can never end the comment or change the file's encoding.
 */
export function pyComment(text: string): string {
	let out = '';
	for (const ch of text) {
		const named = NAMED_ESCAPES[ch];
		if (named !== undefined) out += named;
		else if (isEscapedCodePoint(ch.codePointAt(0) ?? 0)) out += escapeCodePoint(ch.codePointAt(0) ?? 0);
		else out += ch;
	}
	return out.replace(ENCODING_DECLARATION, (_m, word: string, sep: string) => `${word}${escapeCodePoint(sep.charCodeAt(0))}`);
}
