import { describe, expect, it } from 'vitest';
import { structuredPatch } from 'diff';
import { diffText, highlightPair, type TextHunk } from './text-diff';

/** A hunk as unified-diff text: header, then one prefixed line per line. */
function formatHunk(hunk: TextHunk): string[] {
	const out = [hunk.header];
	for (const line of hunk.lines) {
		out.push(`${line.kind === 'added' ? '+' : line.kind === 'removed' ? '-' : ' '}${line.text}`);
		if (line.noNewlineAtEnd) out.push('\\ No newline at end of file');
	}
	return out;
}

// The "lao"/"tzu" example of the GNU diffutils manual ("Unified Format"); the expected hunks are
// that manual's output, confirmed with GNU diffutils' `diff -u` on Debian.
const LAO = [
	'The Way that can be told of is not the eternal Way;',
	'The name that can be named is not the eternal name.',
	'The Nameless is the origin of Heaven and Earth;',
	'The Named is the mother of all things.',
	'Therefore let there always be non-being,',
	'  so we may see their subtlety,',
	'And let there always be being,',
	'  so we may see their outcome.',
	'The two are the same,',
	'But after they are produced,',
	'  they have different names.'
].join('\n') + '\n';
const TZU = [
	'The Nameless is the origin of Heaven and Earth;',
	'The named is the mother of all things.',
	'',
	'Therefore let there always be non-being,',
	'  so we may see their subtlety,',
	'And let there always be being,',
	'  so we may see their outcome.',
	'The two are the same,',
	'But after they are produced,',
	'  they have different names.',
	'They both may be called deep and profound.',
	'Deeper and more profound,',
	'The door of all subtleties!'
].join('\n') + '\n';

describe('diffText: unified hunks', () => {
	it('reproduces the GNU diffutils manual example with 3 lines of context', () => {
		const result = diffText(LAO, TZU);
		expect(result.hunks.flatMap(formatHunk)).toEqual([
			'@@ -1,7 +1,6 @@',
			'-The Way that can be told of is not the eternal Way;',
			'-The name that can be named is not the eternal name.',
			' The Nameless is the origin of Heaven and Earth;',
			'-The Named is the mother of all things.',
			'+The named is the mother of all things.',
			'+',
			' Therefore let there always be non-being,',
			'   so we may see their subtlety,',
			' And let there always be being,',
			'@@ -9,3 +8,6 @@',
			' The two are the same,',
			' But after they are produced,',
			'   they have different names.',
			'+They both may be called deep and profound.',
			'+Deeper and more profound,',
			'+The door of all subtleties!'
		]);
		expect(result.stats).toEqual({ added: 5, removed: 3, modified: 1, hunks: 2, identical: false, exact: true });
	});

	it('gives an empty range the number of the line before it, as diff -U0 does', () => {
		// Expected headers: GNU diffutils `diff -U0` on the same inputs.
		expect(diffText('a\nb\n', 'a\nx\nb\n', { context: 0 }).hunks.map((h) => h.header)).toEqual(['@@ -1,0 +2 @@']);
		expect(diffText('a\nb\nc\n', 'a\nc\n', { context: 0 }).hunks.map((h) => h.header)).toEqual(['@@ -2 +1,0 @@']);
		expect(diffText('', 'p\nq\nr\n').hunks.map((h) => h.header)).toEqual(['@@ -0,0 +1,3 @@']);
	});

	it('marks a missing final newline as diff -u does', () => {
		// Expected lines: GNU diffutils `diff -u` of "a\nb" against "a\nb\n".
		expect(diffText('a\nb', 'a\nb\n').hunks.flatMap(formatHunk)).toEqual(['@@ -1,2 +1,2 @@', ' a', '-b', '\\ No newline at end of file', '+b']);
	});

	it('returns no hunks for identical texts', () => {
		expect(diffText(LAO, LAO)).toEqual({ hunks: [], stats: { added: 0, removed: 0, modified: 0, hunks: 0, identical: true, exact: true } });
	});

	it('agrees with the diff library’s own structured patch on seeded random edits', () => {
		// Reference: jsdiff's structuredPatch (the `diff` package), context 3.
		let seed = 12345;
		const random = (): number => {
			seed = (Math.imul(seed, 1664525) + 1013904223) >>> 0;
			return seed / 4294967296;
		};
		for (let trial = 0; trial < 40; trial++) {
			const base = Array.from({ length: 60 }, (_, i) => `line ${i} ${Math.floor(random() * 5)}`);
			const edited = base.flatMap((line) => {
				const r = random();
				if (r < 0.05) return [];
				if (r < 0.1) return [line, `inserted ${Math.floor(random() * 1000)}`];
				if (r < 0.15) return [`${line} edited`];
				return [line];
			});
			const a = base.join('\n') + '\n';
			const b = edited.join('\n') + '\n';
			const reference = structuredPatch('a', 'b', a, b, undefined, undefined, { context: 3 });
			const ours = diffText(a, b);
			const unifiedStart = (start: number, lines: number): number => (lines === 0 ? start - 1 : start);
			expect(ours.hunks.map((h) => [h.oldStart, h.oldLines, h.newStart, h.newLines])).toEqual(
				reference.hunks.map((h) => [unifiedStart(h.oldStart, h.oldLines), h.oldLines, unifiedStart(h.newStart, h.newLines), h.newLines])
			);
			expect(ours.hunks.map((h) => formatHunk(h).slice(1))).toEqual(reference.hunks.map((h) => h.lines));
		}
	});

	it('numbers each line on the side it belongs to', () => {
		const [hunk] = diffText('a\nb\nc\n', 'a\nB\nc\n').hunks;
		expect(hunk?.lines.map((l) => [l.kind, l.oldNumber, l.newNumber])).toEqual([
			['context', 1, 1],
			['removed', 2, null],
			['added', null, 2],
			['context', 3, 3]
		]);
	});
});

describe('diffText: side-by-side rows', () => {
	it('pairs removed lines with the added lines that replace them, leaving the rest one-sided', () => {
		const [hunk] = diffText('keep\nold 1\nold 2\nend\n', 'keep\nnew 1\nend\n').hunks;
		expect(hunk?.rows.map((r) => [r.kind, r.left?.number ?? null, r.right?.number ?? null])).toEqual([
			['context', 1, 1],
			['changed', 2, 2],
			['removed', 3, null],
			['context', 4, 3]
		]);
	});

	it('highlights only the changed value of a parameter line', () => {
		const [hunk] = diffText('GAIN_INTERVAL_S = 60  # gain solve interval\n', 'GAIN_INTERVAL_S = 30  # gain solve interval\n').hunks;
		const row = hunk?.rows[0];
		expect(row?.kind).toBe('changed');
		expect(row?.left?.spans).toEqual([
			{ text: 'GAIN_INTERVAL_S = ', changed: false },
			{ text: '60', changed: true },
			{ text: '  # gain solve interval', changed: false }
		]);
		expect(row?.right?.spans?.filter((s) => s.changed).map((s) => s.text)).toEqual(['30']);
	});
});

describe('diffText: large rewrites', () => {
	it('stops word highlights after a budget, marking later pairs changed as a whole', () => {
		const a = Array.from({ length: 1000 }, (_, i) => `keep = ${i} # old`).join('\n') + '\n';
		const b = Array.from({ length: 1000 }, (_, i) => `keep = ${i} # new`).join('\n') + '\n';
		const rows = diffText(a, b).hunks.flatMap((h) => h.rows);
		expect(rows).toHaveLength(1000);
		expect(rows[0]?.right?.spans?.filter((s) => s.changed).map((s) => s.text)).toEqual(['new']);
		expect(rows[999]?.right?.spans).toEqual([{ text: 'keep = 999 # new', changed: true }]);
	});

	it('reports when the quicker edit script was used for texts that share little', () => {
		const a = Array.from({ length: 800 }, (_, i) => `left_${i}`).join('\n');
		const b = Array.from({ length: 800 }, (_, i) => `right_${i}`).join('\n');
		const result = diffText(a, b);
		expect(result.stats).toMatchObject({ exact: false, added: 800, removed: 800, hunks: 1 });
	});
});

describe('highlightPair', () => {
	it('rebuilds both lines from their spans', () => {
		const before = "REFERENCE_ANTENNA = 'A07'  # primary";
		const after = "REFERENCE_ANTENNA = 'A12'  # primary choice";
		const { left, right } = highlightPair(before, after);
		expect(left.map((s) => s.text).join('')).toBe(before);
		expect(right.map((s) => s.text).join('')).toBe(after);
		expect(right.filter((s) => s.changed).map((s) => s.text.trim())).toEqual(['A12', 'choice']);
	});

	it('marks very long lines changed as a whole instead of word-diffing them', () => {
		const long = 'x'.repeat(5000);
		expect(highlightPair(long, `${long}y`)).toEqual({ left: [{ text: long, changed: true }], right: [{ text: `${long}y`, changed: true }] });
	});
});
