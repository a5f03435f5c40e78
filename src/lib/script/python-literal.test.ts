import { describe, expect, it } from 'vitest';
import { isEscapedCodePoint, pyComment, pyLiteral, PyLiteralError, pyNumber, pyStr } from './python-literal';
import { runPythonJson } from './python-test-harness';

/** mulberry32, a small seeded generator: the corpus is random-looking but fixed. */
function createRandom(seed: number): () => number {
	let a = seed >>> 0;
	return () => {
		a = (a + 0x6d2b79f5) >>> 0;
		let t = a;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

function pickCodePoint(random: () => number): string {
	const bucket = random();
	// Mix: printable ASCII, C0/C1 controls, the BMP (lone surrogates included) and astral planes.
	if (bucket < 0.35) return String.fromCharCode(0x20 + Math.floor(random() * 0x5f));
	if (bucket < 0.5) return String.fromCharCode(Math.floor(random() * 0x20) + (random() < 0.5 ? 0 : 0x80));
	if (bucket < 0.6) return String.fromCharCode(0xd800 + Math.floor(random() * 0x800));
	if (bucket < 0.85) return String.fromCharCode(Math.floor(random() * 0x10000));
	return String.fromCodePoint(0x10000 + Math.floor(random() * 0x100000));
}

/** ≥ 300 strings chosen to break quoting: every Latin-1 code point, known traps, random text. */
function buildHostileStrings(): string[] {
	const strings: string[] = [];
	for (let cp = 0; cp <= 0xff; cp++) strings.push(String.fromCharCode(cp));
	strings.push(
		'', '"', "'", '"""', "'''", '\\', 'ends with a backslash\\', '\\"', "\\'", '\\\\"', '\\x00', '\\u2028', '\\N{BULLET}',
		'{{', '}}', '{{{title}}}', '{{& notes}}', '%s', '%(x)s', '{0}', '{title!r}', '# ', '#', '\n', '\r\n', '\r',
		'\u2028', '\u2029', '\u0085', '\u000b\u000c', '\u001c\u001d\u001e', '\0', 'a\0b', '\u200e', '\u200f', '\u061c',
		'\u202a\u202b\u202c\u202d\u202e', '\u2066\u2067\u2068\u2069', '\ufeff', '\u200b\u200c\u200d', '\u00ad', '\u00a0', '\u3000',
		'\ue000', '\uffff', '\ufffe', '\ud800', '\udfff', '\udc00\ud800', 'x\ud83d', '\ude00y', '😀', '👩‍🔬', '🇳🇿', '𝄞', '\u{10ffff}',
		'\u{e0001}', 'אבג', 'مرحبا', 'ça va', 'Ṣ̃', '中文字段', 'a\u0301', 'title"; import os; os.system("x"); "',
		'"\n__import__("os").system("x")\n"', "'''\nimport os\n'''", '"""\nimport os\n"""', '\\\nimport os',
		'# coding: utf-7', '+AAo-print(1)', '\u202e# evil \u2066', 'field\tname', ' leading and trailing ',
		'x'.repeat(100_000), '"'.repeat(5000) + '\\'.repeat(5000)
	);
	const random = createRandom(20260314);
	for (let n = 0; n < 120; n++) {
		const length = Math.floor(random() * 40);
		let text = '';
		for (let i = 0; i < length; i++) text += pickCodePoint(random);
		strings.push(text);
	}
	return strings;
}

const STRING_CHECK = String.raw`
import ast, json, sys
data = json.load(open(sys.argv[1], encoding="utf-8"))
bad = []
for i, (expected, literal) in enumerate(zip(data["strings"], data["literals"])):
    source = "x = " + literal + "\n"
    try:
        # Parse the UTF-8 bytes, as python3 reads a program file.
        tree = ast.parse(source.encode("utf-8"))
    except (SyntaxError, UnicodeEncodeError, ValueError) as e:
        bad.append([i, "does not parse: " + str(e)[:200]])
        continue
    body = tree.body
    only_assignment = (
        len(body) == 1 and isinstance(body[0], ast.Assign) and len(body[0].targets) == 1
        and isinstance(body[0].targets[0], ast.Name) and body[0].targets[0].id == "x"
        and isinstance(body[0].value, ast.Constant) and type(body[0].value.value) is str
    )
    if not only_assignment:
        bad.append([i, "not a single string assignment: " + ast.dump(tree)[:200]])
    elif len(source.splitlines()) != 1:
        bad.append([i, "spans more than one line"])
    elif ast.literal_eval(literal) != expected:
        bad.append([i, "value differs"])
print(json.dumps({"checked": len(data["strings"]), "bad": bad}))
`;

describe('pyStr', () => {
	// Escape forms per the Python Language Reference, §2.4.1 "String and Bytes literals".
	it('escapes quotes, backslashes and the named whitespace escapes', () => {
		expect(pyStr('a"b')).toBe('"a\\"b"');
		expect(pyStr("it's")).toBe('"it\'s"');
		expect(pyStr('C:\\dir')).toBe('"C:\\\\dir"');
		expect(pyStr('\n\r\t')).toBe('"\\n\\r\\t"');
	});

	it('escapes NUL, every C0 and C1 control and DEL as \\xHH', () => {
		const controls = [...Array(0x20).keys(), 0x7f, ...Array.from({ length: 0x20 }, (_, i) => 0x80 + i)];
		for (const cp of controls) {
			const ch = String.fromCharCode(cp);
			if (ch === '\n' || ch === '\r' || ch === '\t') continue;
			expect(pyStr(ch)).toBe(`"\\x${cp.toString(16).padStart(2, '0')}"`);
		}
	});

	it('escapes line separators, bidi controls, zero-width characters and lone surrogates', () => {
		expect(pyStr('\u2028\u2029')).toBe('"\\u2028\\u2029"');
		expect(pyStr('\u202e\u2066\u200f\u200b\ufeff')).toBe('"\\u202e\\u2066\\u200f\\u200b\\ufeff"');
		expect(pyStr('\ud800')).toBe('"\\ud800"');
		expect(pyStr('\udfffa')).toBe('"\\udfffa"');
	});

	it('escapes every control, format, separator, non-ASCII space, private-use and surrogate code point', () => {
		// The Unicode Character Database's general categories as python3's unicodedata has them:
		// Cc, Cf, Zl, Zp, Zs (but U+0020), Co and Cs, plus the noncharacters (Unicode §23.7).
		const script = String.raw`
import json, unicodedata
ranges, start, prev = [], None, None
for cp in range(0x110000):
    cat = unicodedata.category(chr(cp))
    hit = cat in ("Cc", "Cf", "Zl", "Zp", "Co", "Cs") or (cat == "Zs" and cp != 0x20) or (0xFDD0 <= cp <= 0xFDEF) or (cp & 0xFFFE) == 0xFFFE
    if hit and start is None:
        start = cp
    if not hit and start is not None:
        ranges.append([start, cp - 1]); start = None
if start is not None:
    ranges.append([start, 0x10FFFF])
print(json.dumps({"version": unicodedata.unidata_version, "ranges": ranges}))
`;
		const { ranges } = runPythonJson(script, null) as { version: string; ranges: [number, number][] };
		const missed: string[] = [];
		for (const [lo, hi] of ranges) {
			for (let cp = lo; cp <= hi; cp++) if (!isEscapedCodePoint(cp)) missed.push(cp.toString(16));
		}
		expect(ranges.length).toBeGreaterThan(20);
		expect(missed).toEqual([]);
	});

	it('keeps printable non-ASCII text and astral characters as they are', () => {
		expect(pyStr('ça 中文 😀 𝄞')).toBe('"ça 中文 😀 𝄞"');
	});

	it('round-trips a corpus of 300+ hostile strings exactly through ast.literal_eval, never as code', () => {
		const strings = buildHostileStrings();
		expect(strings.length).toBeGreaterThanOrEqual(300);
		const literals = strings.map(pyStr);
		for (const literal of literals) expect(literal).not.toMatch(/[\n\r\u2028\u2029\0]/);
		const result = runPythonJson(STRING_CHECK, { strings, literals }) as { checked: number; bad: unknown[] };
		expect(result.checked).toBe(strings.length);
		expect(result.bad).toEqual([]);
	});
});

describe('pyNumber', () => {
	// Binary64 edge values from IEEE 754-2008 (smallest subnormal, smallest normal, largest
	// finite) and ECMA-262's Number.MAX_SAFE_INTEGER = 2**53 - 1.
	const floats = [
		0.1, -0.1, 1 / 3, Math.PI, 1e-7, 1e-300, 5e-324, 2.2250738585072014e-308, 1.7976931348623157e308,
		-1.7976931348623157e308, 123456789.125, 1e21, 1e16, 2 ** 53, 2 ** 53 + 1, -(2 ** 60), 4.564e9, 0.5
	];
	const ints = [0, 1, -1, 42, 1024, 1.0e9, 1.5e9, 2 ** 53 - 1, -(2 ** 53 - 1)];

	function randomDoubles(count: number): number[] {
		const random = createRandom(1609);
		const out: number[] = [];
		const view = new DataView(new ArrayBuffer(8));
		while (out.length < count) {
			view.setUint32(0, Math.floor(random() * 2 ** 32));
			view.setUint32(4, Math.floor(random() * 2 ** 32));
			const value = view.getFloat64(0);
			if (Number.isFinite(value)) out.push(value);
		}
		return out;
	}

	it('writes safe integers as ints and everything else as floats that round-trip exactly', () => {
		const values = [...floats, ...ints, -0, ...randomDoubles(300)];
		const literals = values.map((v) => pyNumber(v));
		const script = String.raw`
import ast, json, sys
data = json.load(open(sys.argv[1]))
out = []
for literal in data:
    v = ast.literal_eval(literal)
    out.append([type(v).__name__, repr(v)])
print(json.dumps(out))
`;
		const parsed = runPythonJson(script, literals) as [string, string][];
		values.forEach((value, i) => {
			const [type, repr] = parsed[i] ?? ['missing', 'NaN'];
			expect(Object.is(Number(repr), value), `${literals[i]} read back as ${repr}`).toBe(true);
			expect(type, literals[i]).toBe(Number.isSafeInteger(value) && !Object.is(value, -0) ? 'int' : 'float');
		});
	});

	it('keeps the sign of negative zero', () => {
		expect(pyNumber(-0)).toBe('-0.0');
	});

	it('marks integral values beyond 2**53 as floats, since JS cannot hold 2**53 + 1 exactly', () => {
		// 2**53 + 1 is not a binary64 value: it rounds to 2**53 (IEEE 754 round-to-nearest-even).
		expect(pyNumber(2 ** 53 + 1)).toBe('9007199254740992.0');
		expect(pyNumber(1e21)).toBe('1e+21');
	});

	it('rejects NaN and infinities with the value path', () => {
		expect(() => pyLiteral({ a: [1, Number.NaN] })).toThrow(/at \$\.a\[1\] .*NaN is not a finite number/);
		expect(() => pyNumber(Number.POSITIVE_INFINITY)).toThrow(PyLiteralError);
		expect(() => pyNumber(Number.NEGATIVE_INFINITY)).toThrow(/-Infinity/);
	});
});

describe('pyLiteral', () => {
	it('maps null, booleans, lists and dicts to Python syntax', () => {
		// Python Language Reference §3.1 built-in constants None/True/False; §6.2.5–6.2.7 displays.
		expect(pyLiteral(null)).toBe('None');
		expect(pyLiteral(true)).toBe('True');
		expect(pyLiteral(false)).toBe('False');
		expect(pyLiteral([])).toBe('[]');
		expect(pyLiteral({})).toBe('{}');
		expect(pyLiteral([1, 'a', [null]])).toBe('[1, "a", [None]]');
	});

	it('keeps object keys in insertion order', () => {
		expect(pyLiteral({ zeta: 1, alpha: 2, mid: 3 })).toBe('{"zeta": 1, "alpha": 2, "mid": 3}');
	});

	it('round-trips nested values with hostile keys and strings through ast.literal_eval', () => {
		const value = {
			'key "with" quotes': ['a\nb', '\u2028', { '\0': null, '😀': [true, false, -0.5] }],
			"'''": { '"""': 1e-300, '\ud800': 'x' },
			fields: { '3C286': ['flux_calibrator', 'bandpass_calibrator'] }
		};
		const literal = pyLiteral(value);
		expect(literal).not.toMatch(/[\n\r]/);
		const script = String.raw`
import ast, json, sys
data = json.load(open(sys.argv[1], encoding="utf-8"))
tree = ast.parse("x = " + data["literal"])
print(json.dumps({"same": ast.literal_eval(data["literal"]) == data["value"], "statements": len(tree.body)}))
`;
		expect(runPythonJson(script, { literal, value })).toEqual({ same: true, statements: 1 });
	});

	it('rejects values that are not JSON, naming where they are', () => {
		expect(() => pyLiteral(undefined)).toThrow(/at \$ as a Python literal: undefined is not a JSON value/);
		expect(() => pyLiteral({ f: () => 1 })).toThrow(/at \$\.f as a Python literal: a function/);
		expect(() => pyLiteral({ when: new Date(0) })).toThrow(/at \$\.when .*a Date object/);
		expect(() => pyLiteral([new Map()])).toThrow(/at \$\[0\] .*a Map object/);
		expect(() => pyLiteral({ 'a b': Symbol('s') })).toThrow(/at \$\["a b"\] .*a symbol/);
		const cyclic: Record<string, unknown> = {};
		cyclic.self = cyclic;
		expect(() => pyLiteral(cyclic)).toThrow(/at \$\.self .*the value contains itself/);
	});

	it('allows the same object twice when it is not a cycle', () => {
		const shared = [1];
		expect(pyLiteral({ a: shared, b: shared })).toBe('{"a": [1], "b": [1]}');
	});
});

describe('pyComment', () => {
	it('turns line breaks and controls into visible escapes and doubles backslashes', () => {
		expect(pyComment('one\ntwo\r\nthree')).toBe('one\\ntwo\\r\\nthree');
		expect(pyComment('a\\nb')).toBe('a\\\\nb');
		expect(pyComment('\u2028\u2029\u0085\0\u202e')).toBe('\\u2028\\u2029\\x85\\x00\\u202e');
		expect(pyComment('ça 中文 😀')).toBe('ça 中文 😀');
	});

	it('neutralises encoding declarations so a title cannot change how python3 decodes the file', () => {
		// PEP 263: a comment on line 1 or 2 matching `coding[:=]\s*([-\w.]+)` sets the source encoding.
		const texts = ['coding: utf-7', '-*- coding=latin-1 -*-', 'vim: set fileencoding=utf-7 :', 'CODING: utf-7'];
		const lines = texts.map((t) => `# ${pyComment(t)}\n`);
		const script = String.raw`
import io, json, sys, tokenize
lines = json.load(open(sys.argv[1], encoding="utf-8"))
def detect(text):
    return tokenize.detect_encoding(io.BytesIO(text.encode("utf-8")).readline)[0]
print(json.dumps({"ours": [detect(l + l) for l in lines["ours"]], "raw": detect(lines["raw"])}))
`;
		const result = runPythonJson(script, { ours: lines, raw: '# coding: utf-7\n' }) as { ours: string[]; raw: string };
		expect(result.raw).toBe('utf-7'); // the threat is real: the raw text switches the codec
		expect(result.ours).toEqual(lines.map(() => 'utf-8'));
	});

	it('keeps every hostile string inside one comment line', () => {
		const strings = buildHostileStrings();
		const comments = strings.map(pyComment);
		const script = String.raw`
import ast, io, json, sys, tokenize
comments = json.load(open(sys.argv[1], encoding="utf-8"))
bad = []
for i, c in enumerate(comments):
    source = "# " + c + "\n# " + c + "\nx = 1  # " + c + "\n"
    raw = source.encode("utf-8")
    try:
        tree = ast.parse(raw)
        encoding = tokenize.detect_encoding(io.BytesIO(raw).readline)[0]
    except (SyntaxError, ValueError) as e:
        bad.append([i, str(e)[:200]])
        continue
    ok = (len(tree.body) == 1 and isinstance(tree.body[0], ast.Assign) and len(source.splitlines()) == 3
          and encoding == "utf-8")
    if not ok:
        bad.append([i, ast.dump(tree)[:200], encoding])
print(json.dumps({"checked": len(comments), "bad": bad}))
`;
		const result = runPythonJson(script, comments) as { checked: number; bad: unknown[] };
		expect(result.checked).toBe(strings.length);
		expect(result.bad).toEqual([]);
	});
});
