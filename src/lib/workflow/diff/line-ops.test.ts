import { describe, expect, it } from 'vitest';
import { listLineOps, splitKeepingNewlines, type LineOp } from './line-ops';

function rebuild(ops: LineOp[], side: 'old' | 'new'): string {
	return ops.filter((op) => op.kind === 'context' || op.kind === (side === 'old' ? 'removed' : 'added')).map((op) => op.line).join('');
}

function createRandom(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		return s / 4294967296;
	};
}

describe('splitKeepingNewlines', () => {
	it('keeps each terminator and leaves a last line without one as it is', () => {
		expect(splitKeepingNewlines('a\nb\n')).toEqual(['a\n', 'b\n']);
		expect(splitKeepingNewlines('a\nb')).toEqual(['a\n', 'b']);
		expect(splitKeepingNewlines('')).toEqual([]);
		expect(splitKeepingNewlines('\n')).toEqual(['\n']);
	});
});

describe('listLineOps', () => {
	it('uses the minimal diff for a small change', () => {
		const { ops, exact } = listLineOps('a\nb\nc\n', 'a\nB\nc\n');
		expect(exact).toBe(true);
		expect(ops.map((op) => op.kind)).toEqual(['context', 'removed', 'added', 'context']);
	});

	it('falls back for two unrelated programs and still gives an edit script that rebuilds both', () => {
		const a = Array.from({ length: 1500 }, (_, i) => `alpha_${i} = ${i * 7}\n`).join('');
		const b = Array.from({ length: 1500 }, (_, i) => `beta_${i} = ${i * 3}\n`).join('');
		const { ops, exact } = listLineOps(a, b);
		expect(exact).toBe(false);
		expect(rebuild(ops, 'old')).toBe(a);
		expect(rebuild(ops, 'new')).toBe(b);
	});

	it('keeps every untouched line as context when many scattered lines change', () => {
		const random = createRandom(99);
		const base = Array.from({ length: 1500 }, (_, i) => `value_${i} = ${i}\n`);
		let untouched = 0;
		const edited = base.map((line) => {
			if (random() < 0.3) return line.replace('\n', ' + 1\n');
			untouched++;
			return line;
		});
		const { ops, exact } = listLineOps(base.join(''), edited.join(''));
		// About 450 changed lines need about 900 edits, past the exact diff's bound.
		expect(exact).toBe(false);
		expect(rebuild(ops, 'old')).toBe(base.join(''));
		expect(rebuild(ops, 'new')).toBe(edited.join(''));
		// Every untouched line is unique in both texts, so the anchoring keeps all of them.
		expect(ops.filter((op) => op.kind === 'context')).toHaveLength(untouched);
	});

	it('rebuilds both texts on seeded random edits with repeated lines and a missing final newline', () => {
		const random = createRandom(2024);
		for (let trial = 0; trial < 30; trial++) {
			const pool = ['', 'x = 1', 'return x', 'pass', '# note'];
			const base = Array.from({ length: 400 }, () => pool[Math.floor(random() * pool.length)] ?? '');
			const edited = base.map((line) => (random() < 0.5 ? `${line} ${Math.floor(random() * 9)}` : line));
			const a = base.join('\n');
			const b = `${edited.join('\n')}\n`;
			const { ops } = listLineOps(a, b);
			expect(rebuild(ops, 'old')).toBe(a);
			expect(rebuild(ops, 'new')).toBe(b);
		}
	});
});
