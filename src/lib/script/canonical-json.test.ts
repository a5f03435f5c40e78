import { describe, expect, it } from 'vitest';
import { canonicalJson } from './canonical-json';
import { runPythonJson } from './python-test-harness';

describe('canonicalJson', () => {
	it('sorts keys by UTF-16 code units', () => {
		// RFC 8785 §3.2.3 sorting example (from memory): keys "\u20ac", "\r", "\ufb33", "1",
		// "\ud83d\ude00", "\u0080", "\u00f6" sort as \r, 1, \u0080, \u00f6, \u20ac, \ud83d\ude00, \ufb33.
		const value = { '\u20ac': 'Euro Sign', '\r': 'Carriage Return', '\ufb33': 'Hebrew Letter Dalet With Dagesh', '1': 'One', '\ud83d\ude00': 'Emoji: Grinning Face', '\u0080': 'Control', '\u00f6': 'Latin Small Letter O With Diaeresis' };
		const keys = Object.keys(JSON.parse(canonicalJson(value)) as Record<string, string>);
		// JSON.parse puts the integer-like key "1" first again, so compare the text order instead.
		const order = ['\r', '1', '\u0080', '\u00f6', '\u20ac', '\ud83d\ude00', '\ufb33'].map((k) => canonicalJson(value).indexOf(JSON.stringify(k) + ':'));
		expect(keys).toHaveLength(7);
		expect([...order].sort((a, b) => a - b)).toEqual(order);
	});

	it('writes numbers as ECMAScript does, the form RFC 8785 adopts', () => {
		// RFC 8785 Appendix B number examples (from memory): 1e+21, 1e-7, 0.000001, -0 → 0.
		expect(canonicalJson([1e21, 1e-7, 0.000001, -0, 333333333.3333333])).toBe('[1e+21,1e-7,0.000001,0,333333333.3333333]');
	});

	it('has no whitespace and drops members whose value is undefined', () => {
		expect(canonicalJson({ b: [1, { d: null, c: true }], a: 'x', z: undefined })).toBe('{"a":"x","b":[1,{"c":true,"d":null}]}');
	});

	it('matches Python json.dumps(sort_keys=True, separators=(",", ":")) for a nested, non-ASCII value', () => {
		const value = { title: 'Ça va "ok"\n\u2028', fields: [{ roles: ['target'], name: '中文' }], spectral_window_id: 0, x: 0.1, big: 1e300, tiny: 5e-324 };
		const script = String.raw`
import json, sys
value = json.load(open(sys.argv[1], encoding="utf-8"))
print(json.dumps(json.dumps(value, sort_keys=True, separators=(",", ":"), ensure_ascii=False)))
`;
		expect(runPythonJson(script, value)).toBe(canonicalJson(value));
	});

	it('rejects NaN, infinities, undefined in arrays, non-plain objects and cycles', () => {
		expect(() => canonicalJson({ a: Number.NaN })).toThrow(/at \$\.a as canonical JSON: NaN/);
		expect(() => canonicalJson([Number.POSITIVE_INFINITY])).toThrow(/Infinity/);
		expect(() => canonicalJson([undefined])).toThrow(/at \$\[0\] as canonical JSON: undefined/);
		expect(() => canonicalJson({ d: new Date(0) })).toThrow(/plain objects/);
		const cyclic: unknown[] = [];
		cyclic.push(cyclic);
		expect(() => canonicalJson(cyclic)).toThrow(/cycle/);
	});
});
