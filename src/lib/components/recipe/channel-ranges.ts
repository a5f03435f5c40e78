import type { ChannelRange } from '$lib/calibration/recipe';
import { makeErr, makeOk, type Result } from '$lib/calibration/result';

/*
 * Channel ranges on a strip of `width` px: channel c covers [c·width/n, (c+1)·width/n). Ranges are inclusive
 * ({ start, end }, DESIGN.md "Channel range"); a normalised list is sorted, with no overlapping or touching ranges.
 */

/** Left edge of a channel on the strip, px. */
export function convertChannelToX(channel: number, nChan: number, width: number): number {
	return (channel / nChan) * width;
}

/** The channel under a strip position (clamped to the window). */
export function convertXToChannel(x: number, nChan: number, width: number): number {
	const c = Math.floor((x / width) * nChan);
	return Math.min(nChan - 1, Math.max(0, c));
}

/** A range as a strip rectangle, at least 1 px wide. */
export function convertRangeToRect(range: ChannelRange, nChan: number, width: number): { x: number; width: number } {
	const x = convertChannelToX(range.start, nChan, width);
	const w = Math.max(1, convertChannelToX(range.end + 1, nChan, width) - x);
	return { x: Math.min(x, width - w), width: w };
}

/** Sort, clip to the window (when `nChan` is given), orient start ≤ end, and merge overlapping or touching ranges. */
export function normaliseRanges(ranges: readonly ChannelRange[], nChan?: number): ChannelRange[] {
	const last = nChan === undefined ? Number.POSITIVE_INFINITY : nChan - 1;
	const oriented = ranges
		.map((r) => ({ start: Math.max(0, Math.min(r.start, r.end)), end: Math.min(last, Math.max(r.start, r.end)) }))
		.filter((r) => r.start <= r.end)
		.sort((a, b) => a.start - b.start || a.end - b.end);
	const out: ChannelRange[] = [];
	for (const r of oriented) {
		const prev = out[out.length - 1];
		if (prev && r.start <= prev.end + 1) prev.end = Math.max(prev.end, r.end);
		else out.push({ ...r });
	}
	return out;
}

/** Add a range (either orientation) and normalise. */
export function addRange(ranges: readonly ChannelRange[], range: ChannelRange, nChan?: number): ChannelRange[] {
	return normaliseRanges([...ranges, range], nChan);
}

/** Index of the range that contains a channel, or -1. */
export function findRangeAt(ranges: readonly ChannelRange[], channel: number): number {
	return ranges.findIndex((r) => channel >= Math.min(r.start, r.end) && channel <= Math.max(r.start, r.end));
}

/** Remove the whole range that contains a channel; the list is returned unchanged when none does. */
export function removeRangeAt(ranges: readonly ChannelRange[], channel: number): ChannelRange[] {
	const i = findRangeAt(ranges, channel);
	return i < 0 ? [...ranges] : ranges.filter((_, j) => j !== i);
}

/** Remove the channels of `cut` from every range (splitting where needed). */
export function subtractRange(ranges: readonly ChannelRange[], cut: ChannelRange): ChannelRange[] {
	const lo = Math.min(cut.start, cut.end);
	const hi = Math.max(cut.start, cut.end);
	const out: ChannelRange[] = [];
	for (const r of normaliseRanges(ranges)) {
		if (r.end < lo || r.start > hi) out.push(r);
		else {
			if (r.start < lo) out.push({ start: r.start, end: lo - 1 });
			if (r.end > hi) out.push({ start: hi + 1, end: r.end });
		}
	}
	return out;
}

/** Number of distinct channels covered by the ranges (clipped to the window). */
export function countChannels(ranges: readonly ChannelRange[], nChan: number): number {
	return normaliseRanges(ranges, nChan).reduce((n, r) => n + r.end - r.start + 1, 0);
}

export type UsableChannels = { channels: number; bandwidthHz: number };
export type ChannelSummary = {
	/** Clean channels that are not excluded: what the provisional phase solve sums over. */
	clean: UsableChannels;
	/** All channels of the window that are not excluded: what the bandpass and gain solves use. */
	window: UsableChannels;
};

/** Usable channel counts and bandwidths (|channel width| × channels). */
export function summariseChannels(input: { nChan: number; chanWidthHz: number; clean: readonly ChannelRange[]; excluded: readonly ChannelRange[] }): ChannelSummary {
	const { nChan } = input;
	const excluded = normaliseRanges(input.excluded, nChan);
	const cleanLeft = excluded.reduce<ChannelRange[]>((list, cut) => subtractRange(list, cut), normaliseRanges(input.clean, nChan));
	const cleanCount = countChannels(cleanLeft, nChan);
	const windowCount = nChan - countChannels(excluded, nChan);
	const width = Math.abs(input.chanWidthHz);
	return { clean: { channels: cleanCount, bandwidthHz: cleanCount * width }, window: { channels: windowCount, bandwidthHz: windowCount * width } };
}

export type RangeParseError = { token: string; message: string };

// Hyphen-minus, hyphen, non-breaking hyphen, figure dash, en dash, em dash, minus sign.
const DASHES = '\\-\u2010\u2011\u2012\u2013\u2014\u2212';
const RANGE_RE = new RegExp(`^(\\d+)\\s*[${DASHES}]\\s*(\\d+)$`);
const SINGLE_RE = /^\d+$/;

/**
 * Parse typed ranges such as "100–400, 500-520, 612": comma- or semicolon-separated, each a channel or
 * start–end (any dash, spaces allowed). Errors name the offending token and say how to fix it.
 */
export function parseRanges(text: string, nChan: number): Result<ChannelRange[], RangeParseError> {
	const tokens = text
		.split(/[,;\n]/)
		.map((t) => t.trim())
		.filter((t) => t.length > 0);
	const ranges: ChannelRange[] = [];
	const last = nChan - 1;
	for (const token of tokens) {
		let start: number;
		let end: number;
		const pair = RANGE_RE.exec(token);
		if (pair) {
			start = Number(pair[1]);
			end = Number(pair[2]);
		} else if (SINGLE_RE.test(token)) {
			start = end = Number(token);
		} else {
			return makeErr({
				token,
				message: `"${token}" is not a channel or a channel range: write whole channel numbers such as 100–400 or 612, separated by commas`
			});
		}
		if (start > end) {
			return makeErr({ token, message: `"${token}" starts after it ends: write the lower channel first (${end}–${start})` });
		}
		if (end > last) {
			return makeErr({ token, message: `"${token}" goes past the last channel of this window, ${last} (channels are numbered 0 to ${last})` });
		}
		ranges.push({ start, end });
	}
	return makeOk(normaliseRanges(ranges, nChan));
}

/** Format ranges as "100–400, 500–520, 612" (en dash; a one-channel range as its number); parseRanges reads it back. */
export function formatRanges(ranges: readonly ChannelRange[]): string {
	return normaliseRanges(ranges)
		.map((r) => (r.start === r.end ? String(r.start) : `${r.start}\u2013${r.end}`))
		.join(', ');
}

/** Centre frequency of a channel, Hz. */
export function computeChannelFreqHz(channel: number, firstFreqHz: number, chanWidthHz: number): number {
	return firstFreqHz + channel * chanWidthHz;
}

/** A range's channel-centre frequencies as text, e.g. "1040.000–1160.000 MHz". */
export function describeRangeFrequency(range: ChannelRange, firstFreqHz: number, chanWidthHz: number): string {
	const a = computeChannelFreqHz(range.start, firstFreqHz, chanWidthHz) / 1e6;
	const b = computeChannelFreqHz(range.end, firstFreqHz, chanWidthHz) / 1e6;
	const [lo, hi] = a <= b ? [a, b] : [b, a];
	return lo === hi ? `${formatMHz(lo)} MHz` : `${formatMHz(lo)}\u2013${formatMHz(hi)} MHz`;
}

/** MHz with enough decimals to tell neighbouring kHz-wide channels apart. */
export function formatMHz(mhz: number): string {
	return mhz.toFixed(3);
}
