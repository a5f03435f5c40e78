// Shared by the benchmarks: medians of repeated timings.

/** Median of a list of numbers (NaN when empty). */
export function median(xs: readonly number[]): number {
	const s = [...xs].sort((a, b) => a - b);
	if (s.length === 0) return NaN;
	const m = Math.floor(s.length / 2);
	return s.length % 2 ? (s[m] ?? NaN) : ((s[m - 1] ?? 0) + (s[m] ?? 0)) / 2;
}

/** Median wall time of `run` in milliseconds after a short warm-up. */
export function measureMedianMs(run: () => void, repeats: number): number {
	for (let i = 0; i < Math.min(50, repeats); i++) run();
	const times: number[] = [];
	for (let i = 0; i < repeats; i++) {
		const start = performance.now();
		run();
		times.push(performance.now() - start);
	}
	return median(times);
}
