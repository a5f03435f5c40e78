/*
 * Scaling helpers for the small SVG plots. Nice ticks use steps of 1, 2 or 5 × 10^k, the usual choice for axis
 * labels (common practice; the same idea as Heckbert's "nice numbers", Graphics Gems 1990, from memory).
 */

export type Bounds = { xMin: number; xMax: number; yMin: number; yMax: number };

/** Round away binary noise from a tick value that is a multiple of `step`. */
function roundToStep(value: number, step: number): number {
	const decimals = Math.max(0, -Math.floor(Math.log10(step)) + 1);
	return Number(value.toFixed(Math.min(decimals, 15)));
}

/** The nice step (1, 2 or 5 × 10^k) for about `maxCount` intervals over a span. */
export function chooseNiceStep(span: number, maxCount: number): number {
	if (!(span > 0) || !(maxCount >= 1)) return 1;
	const raw = span / maxCount;
	const magnitude = 10 ** Math.floor(Math.log10(raw));
	const residual = raw / magnitude;
	const factor = residual <= 1 ? 1 : residual <= 2 ? 2 : residual <= 5 ? 5 : 10;
	return factor * magnitude;
}

/** Tick values that are multiples of a nice step inside [min, max], at most `maxCount` + 1 of them. */
export function computeNiceTicks(min: number, max: number, maxCount = 5): number[] {
	const lo = Math.min(min, max);
	const hi = Math.max(min, max);
	if (lo === hi) return [lo];
	const step = chooseNiceStep(hi - lo, maxCount);
	const ticks: number[] = [];
	const first = Math.ceil(lo / step - 1e-9);
	const last = Math.floor(hi / step + 1e-9);
	for (let i = first; i <= last; i++) ticks.push(roundToStep(i * step, step) + 0);
	return ticks;
}

/**
 * Bounds for an equal-aspect plot (one metre is the same number of px on both axes) of points in a box of
 * `widthPx` × `heightPx`: the data's bounding box, padded by `padFraction` of its larger side, grown along the
 * short axis so the data sit centred. `scale` is px per data unit.
 */
export function computeEqualAspectBounds(
	points: readonly { x: number; y: number }[],
	widthPx: number,
	heightPx: number,
	padFraction = 0.05
): Bounds & { scale: number } {
	const xs = points.map((p) => p.x);
	const ys = points.map((p) => p.y);
	let xMin = xs.length ? Math.min(...xs) : -1;
	let xMax = xs.length ? Math.max(...xs) : 1;
	let yMin = ys.length ? Math.min(...ys) : -1;
	let yMax = ys.length ? Math.max(...ys) : 1;
	// A single point (or a line of points) still needs a non-zero extent.
	const extent = Math.max(xMax - xMin, yMax - yMin) || 1;
	const pad = extent * padFraction;
	xMin -= pad;
	xMax += pad;
	yMin -= pad;
	yMax += pad;
	const scale = Math.min(widthPx / Math.max(xMax - xMin, 1e-12), heightPx / Math.max(yMax - yMin, 1e-12));
	const cx = (xMin + xMax) / 2;
	const cy = (yMin + yMax) / 2;
	const halfW = widthPx / scale / 2;
	const halfH = heightPx / scale / 2;
	return { xMin: cx - halfW, xMax: cx + halfW, yMin: cy - halfH, yMax: cy + halfH, scale };
}

/** A linear map from a data domain to a pixel range (either may run downwards). */
export function createLinearScale(domain: readonly [number, number], range: readonly [number, number]): (v: number) => number {
	const [d0, d1] = domain;
	const [r0, r1] = range;
	const k = d1 === d0 ? 0 : (r1 - r0) / (d1 - d0);
	return (v) => r0 + (v - d0) * k;
}

/** A logarithmic map (base 10) from a positive data domain to a pixel range. */
export function createLogScale(domain: readonly [number, number], range: readonly [number, number]): (v: number) => number {
	const linear = createLinearScale([Math.log10(domain[0]), Math.log10(domain[1])], range);
	return (v) => linear(Math.log10(v));
}

/** Ticks for a log axis: 1, 2, 5 × 10^k inside [min, max]; when that gives fewer than 2, nice linear ticks instead. */
export function computeLogTicks(min: number, max: number, maxCount = 6): number[] {
	const lo = Math.min(min, max);
	const hi = Math.max(min, max);
	if (!(lo > 0)) return [];
	const ticks: number[] = [];
	for (let k = Math.floor(Math.log10(lo)); k <= Math.ceil(Math.log10(hi)); k++) {
		for (const m of [1, 2, 5]) {
			const v = Number((m * 10 ** k).toPrecision(12));
			if (v >= lo * (1 - 1e-12) && v <= hi * (1 + 1e-12)) ticks.push(v);
		}
	}
	if (ticks.length >= 2 && ticks.length <= maxCount) return ticks;
	if (ticks.length > maxCount) return ticks.filter((v) => Math.abs(Math.log10(v) - Math.round(Math.log10(v))) < 1e-9);
	return computeNiceTicks(lo, hi, Math.max(2, maxCount - 1));
}

/** `n` values evenly spaced in log between `min` and `max` (both included). */
export function sampleLogSpaced(min: number, max: number, n: number): number[] {
	if (n <= 1) return [min];
	const a = Math.log10(min);
	const b = Math.log10(max);
	return Array.from({ length: n }, (_, i) => 10 ** (a + ((b - a) * i) / (n - 1)));
}
