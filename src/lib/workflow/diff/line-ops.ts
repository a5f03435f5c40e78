import { diffArrays, diffLines, type Change } from 'diff';

// The line-level edit script behind the text diff. The diff library's minimal (Myers) diff
// costs O(N·D): fine for a reviewed change, seconds for two programs that share little.
// Past a bound on D we anchor on lines that occur once in each text (the "patience" idea),
// diff the small gaps between anchors, and show a gap that is still too different as
// replaced. The result is always a correct edit script; it is just not always minimal.

export type LineOp = { kind: 'context' | 'added' | 'removed'; line: string };

/** Edits the minimal diff may spend before we fall back; keeps the worst case to tens of ms on 1,500-line programs. */
const EXACT_EDIT_LIMIT = 200;
const GAP_EDIT_LIMIT = 100;

/** Lines with their terminators, so "x" at the end of a text differs from "x\n", as in a unified diff. */
export function splitKeepingNewlines(text: string): string[] {
	if (text === '') return [];
	const lines = text.split('\n').map((l) => `${l}\n`);
	const last = lines.length - 1;
	if (text.endsWith('\n')) lines.pop();
	else lines[last] = (lines[last] ?? '\n').slice(0, -1);
	return lines;
}

function pushChanges(out: LineOp[], changes: Change[] | { value: string[]; added: boolean; removed: boolean }[]): void {
	for (const change of changes) {
		const kind = change.added ? 'added' : change.removed ? 'removed' : 'context';
		const lines = typeof change.value === 'string' ? splitKeepingNewlines(change.value) : change.value;
		for (const line of lines) out.push({ kind, line });
	}
}

/** Indices (in a) and (in b) of lines that occur exactly once in each, in an order increasing in both. */
function findAnchors(a: readonly string[], b: readonly string[]): [number, number][] {
	const count = new Map<string, { a: number; b: number; ia: number; ib: number }>();
	a.forEach((line, i) => {
		const c = count.get(line);
		if (c) c.a++;
		else count.set(line, { a: 1, b: 0, ia: i, ib: -1 });
	});
	b.forEach((line, i) => {
		const c = count.get(line);
		if (c) {
			c.b++;
			c.ib = i;
		}
	});
	const pairs = [...count.values()].filter((c) => c.a === 1 && c.b === 1).map((c): [number, number] => [c.ia, c.ib]);
	pairs.sort((x, y) => x[0] - y[0]);
	// Longest increasing subsequence in b's index (patience sorting), O(k log k).
	const tails: number[] = [];
	const prev: number[] = new Array<number>(pairs.length).fill(-1);
	pairs.forEach(([, ib], k) => {
		let lo = 0;
		let hi = tails.length;
		while (lo < hi) {
			const mid = (lo + hi) >> 1;
			if ((pairs[tails[mid] ?? 0]?.[1] ?? 0) < ib) lo = mid + 1;
			else hi = mid;
		}
		prev[k] = lo > 0 ? (tails[lo - 1] ?? -1) : -1;
		tails[lo] = k;
	});
	const chain: [number, number][] = [];
	for (let k = tails[tails.length - 1] ?? -1; k >= 0; k = prev[k] ?? -1) {
		const pair = pairs[k];
		if (pair) chain.push(pair);
	}
	return chain.reverse();
}

function diffAnchored(out: LineOp[], a: readonly string[], b: readonly string[]): void {
	let start = 0;
	while (start < a.length && start < b.length && a[start] === b[start]) out.push({ kind: 'context', line: a[start++] ?? '' });
	let endA = a.length;
	let endB = b.length;
	while (endA > start && endB > start && a[endA - 1] === b[endB - 1]) {
		endA--;
		endB--;
	}
	const midA = a.slice(start, endA);
	const midB = b.slice(start, endB);
	const anchors = midA.length > 0 && midB.length > 0 ? findAnchors(midA, midB) : [];
	if (anchors.length === 0) {
		const changes = midA.length > 0 && midB.length > 0 ? diffArrays(midA, midB, { maxEditLength: GAP_EDIT_LIMIT }) : undefined;
		if (changes) pushChanges(out, changes);
		else {
			for (const line of midA) out.push({ kind: 'removed', line });
			for (const line of midB) out.push({ kind: 'added', line });
		}
	} else {
		let ia = 0;
		let ib = 0;
		for (const [xa, xb] of anchors) {
			diffAnchored(out, midA.slice(ia, xa), midB.slice(ib, xb));
			out.push({ kind: 'context', line: midA[xa] ?? '' });
			ia = xa + 1;
			ib = xb + 1;
		}
		diffAnchored(out, midA.slice(ia), midB.slice(ib));
	}
	for (const line of a.slice(endA)) out.push({ kind: 'context', line });
}

/** The line edit script from `a` to `b`; `exact` is false when the fallback (correct, maybe not minimal) was used. */
export function listLineOps(a: string, b: string): { ops: LineOp[]; exact: boolean } {
	const ops: LineOp[] = [];
	const changes = diffLines(a, b, { maxEditLength: EXACT_EDIT_LIMIT });
	if (changes) {
		pushChanges(ops, changes);
		return { ops, exact: true };
	}
	diffAnchored(ops, splitKeepingNewlines(a), splitKeepingNewlines(b));
	return { ops, exact: false };
}
