import { diffWordsWithSpace } from 'diff';
import { listLineOps } from './line-ops';

// Line diff of two rendered programs as plain data: unified hunks, a side-by-side row
// model and intra-line highlights. The view only draws it (STYLE.md §7).

export type LineKind = 'context' | 'added' | 'removed';
/** A piece of one line; `changed` marks the words that differ from the paired line. */
export type Span = { text: string; changed: boolean };
/** One line of a unified hunk. Line numbers are 1-based; null on the side the line is absent from. */
export type DiffLine = {
	kind: LineKind;
	oldNumber: number | null;
	newNumber: number | null;
	text: string;
	/** Present on a removed/added line paired with its replacement. */
	spans?: Span[];
	/** The text ends on this line without a final newline. */
	noNewlineAtEnd?: true;
};
export type SideCell = { number: number; text: string; spans?: Span[]; noNewlineAtEnd?: true };
export type SideBySideRow = { kind: 'context' | 'changed' | 'removed' | 'added'; left: SideCell | null; right: SideCell | null };
/** Ranges follow the unified format: a start of 0 lines is the line before the change. */
export type TextHunk = { oldStart: number; oldLines: number; newStart: number; newLines: number; header: string; lines: DiffLine[]; rows: SideBySideRow[] };
/** `exact` is false when the texts differ so much that a quicker, possibly longer, edit script was used. */
export type TextDiffStats = { added: number; removed: number; modified: number; hunks: number; identical: boolean; exact: boolean };
export type TextDiff = { hunks: TextHunk[]; stats: TextDiffStats };

const DEFAULT_CONTEXT = 3;
/** Past this length a line pair is marked changed as a whole: word diffs of huge lines cost more than they show. */
const MAX_HIGHLIGHT_CHARS = 2000;
/** Characters word-diffed per text diff; a rewrite of a whole program is shown without word highlights past it. */
const HIGHLIGHT_BUDGET_CHARS = 12_000;

function numberLines(a: string, b: string): { lines: DiffLine[]; exact: boolean } {
	const { ops, exact } = listLineOps(a, b);
	const lines: DiffLine[] = [];
	let oldNumber = 0;
	let newNumber = 0;
	for (const { kind, line: raw } of ops) {
		const ended = raw.endsWith('\n');
		const line: DiffLine = {
			kind,
			oldNumber: kind === 'added' ? null : ++oldNumber,
			newNumber: kind === 'removed' ? null : ++newNumber,
			text: ended ? raw.slice(0, -1) : raw
		};
		if (!ended) line.noNewlineAtEnd = true;
		lines.push(line);
	}
	return { lines, exact };
}

function mergeSpans(parts: Span[]): Span[] {
	const merged: Span[] = [];
	for (const part of parts) {
		const prev = merged[merged.length - 1];
		if (part.text === '') continue;
		if (prev && prev.changed === part.changed) prev.text += part.text;
		else merged.push({ ...part });
	}
	return merged;
}

/** Word-level highlights for a removed line and the added line that replaced it. */
export function highlightPair(before: string, after: string): { left: Span[]; right: Span[] } {
	return highlightWithin(before, after, { chars: Infinity });
}

function highlightWithin(before: string, after: string, budget: { chars: number }): { left: Span[]; right: Span[] } {
	const cost = before.length + after.length;
	if (before.length > MAX_HIGHLIGHT_CHARS || after.length > MAX_HIGHLIGHT_CHARS || cost > budget.chars) {
		return { left: [{ text: before, changed: true }], right: [{ text: after, changed: true }] };
	}
	budget.chars -= cost;
	const left: Span[] = [];
	const right: Span[] = [];
	for (const part of diffWordsWithSpace(before, after)) {
		if (!part.added) left.push({ text: part.value, changed: part.removed });
		if (!part.removed) right.push({ text: part.value, changed: part.added });
	}
	return { left: mergeSpans(left), right: mergeSpans(right) };
}

function toCell(line: DiffLine, number: number | null): SideCell | null {
	if (number === null) return null;
	const cell: SideCell = { number, text: line.text };
	if (line.spans) cell.spans = line.spans;
	if (line.noNewlineAtEnd) cell.noNewlineAtEnd = true;
	return cell;
}

/** Pairs each run of removed lines with the added lines after it; adds highlights to the pairs. */
function buildRows(lines: DiffLine[], budget: { chars: number }): { rows: SideBySideRow[]; modified: number } {
	const rows: SideBySideRow[] = [];
	let modified = 0;
	let i = 0;
	while (i < lines.length) {
		const line = lines[i];
		if (!line) break;
		if (line.kind === 'context') {
			rows.push({ kind: 'context', left: toCell(line, line.oldNumber), right: toCell(line, line.newNumber) });
			i++;
			continue;
		}
		const removed: DiffLine[] = [];
		const added: DiffLine[] = [];
		for (; i < lines.length; i++) {
			const next = lines[i];
			if (!next || next.kind === 'context') break;
			(next.kind === 'removed' ? removed : added).push(next);
		}
		for (let k = 0; k < Math.max(removed.length, added.length); k++) {
			const left = removed[k];
			const right = added[k];
			if (left && right) {
				const spans = highlightWithin(left.text, right.text, budget);
				left.spans = spans.left;
				right.spans = spans.right;
				modified++;
				rows.push({ kind: 'changed', left: toCell(left, left.oldNumber), right: toCell(right, right.newNumber) });
			} else if (left) rows.push({ kind: 'removed', left: toCell(left, left.oldNumber), right: null });
			else if (right) rows.push({ kind: 'added', left: null, right: toCell(right, right.newNumber) });
		}
	}
	return { rows, modified };
}

function formatRange(start: number, count: number): string {
	return count === 1 ? String(start) : `${start},${count}`;
}

/** Diff two program texts line by line into unified hunks with `context` lines around each change (default 3). */
export function diffText(a: string, b: string, options: { context?: number } = {}): TextDiff {
	const context = Math.max(0, Math.floor(options.context ?? DEFAULT_CONTEXT));
	const { lines: ops, exact } = a === b ? { lines: [], exact: true } : numberLines(a, b);
	const changeAt: number[] = [];
	ops.forEach((op, i) => {
		if (op.kind !== 'context') changeAt.push(i);
	});

	// Group changes whose context would touch or overlap into one hunk.
	const groups: { from: number; to: number }[] = [];
	for (const i of changeAt) {
		const last = groups[groups.length - 1];
		if (last && i - last.to <= 2 * context + 1) last.to = i;
		else groups.push({ from: i, to: i });
	}

	const hunks: TextHunk[] = [];
	let added = 0;
	let removed = 0;
	let modified = 0;
	const budget = { chars: HIGHLIGHT_BUDGET_CHARS };
	let scanned = 0;
	let oldBefore = 0;
	let newBefore = 0;
	for (const group of groups) {
		const from = Math.max(0, group.from - context);
		const to = Math.min(ops.length - 1, group.to + context);
		const lines = ops.slice(from, to + 1);
		for (; scanned < from; scanned++) {
			const skipped = ops[scanned];
			if (!skipped) break;
			if (skipped.oldNumber !== null) oldBefore++;
			if (skipped.newNumber !== null) newBefore++;
		}
		const oldLines = lines.filter((l) => l.oldNumber !== null).length;
		const newLines = lines.filter((l) => l.newNumber !== null).length;
		const oldStart = oldLines > 0 ? oldBefore + 1 : oldBefore;
		const newStart = newLines > 0 ? newBefore + 1 : newBefore;
		const built = buildRows(lines, budget);
		added += lines.filter((l) => l.kind === 'added').length;
		removed += lines.filter((l) => l.kind === 'removed').length;
		modified += built.modified;
		hunks.push({
			oldStart,
			oldLines,
			newStart,
			newLines,
			header: `@@ -${formatRange(oldStart, oldLines)} +${formatRange(newStart, newLines)} @@`,
			lines,
			rows: built.rows
		});
	}
	return { hunks, stats: { added, removed, modified, hunks: hunks.length, identical: a === b, exact } };
}
