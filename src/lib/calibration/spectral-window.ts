import type { ChannelRange } from './recipe';
import type { SpectralWindow } from './observation-schema';

/** Frequency of a channel centre, Hz. */
export function getChannelFreqHz(spw: SpectralWindow, channel: number): number {
	return spw.first_freq_hz + channel * spw.chan_width_hz;
}

/** Centre frequency of the window (mean of the first and last channel centres), Hz. */
export function getCentreFreqHz(spw: SpectralWindow): number {
	return (getChannelFreqHz(spw, 0) + getChannelFreqHz(spw, spw.n_chan - 1)) / 2;
}

/** Lowest and highest channel-centre frequencies, Hz. */
export function getFreqSpanHz(spw: SpectralWindow): [number, number] {
	const a = getChannelFreqHz(spw, 0);
	const b = getChannelFreqHz(spw, spw.n_chan - 1);
	return a <= b ? [a, b] : [b, a];
}

/** Mark channels covered by ranges (clipped to the window). */
export function markChannels(nChan: number, ranges: readonly ChannelRange[]): Uint8Array {
	const mask = new Uint8Array(nChan);
	for (const r of ranges) {
		const lo = Math.max(0, r.start);
		const hi = Math.min(nChan - 1, r.end);
		for (let c = lo; c <= hi; c++) mask[c] = 1;
	}
	return mask;
}

/** Number of channels counted once: inside `include` (or all when `include` is null) and outside `exclude`. */
export function countUsableChannels(nChan: number, include: readonly ChannelRange[] | null, exclude: readonly ChannelRange[]): number {
	const inc = include ? markChannels(nChan, include) : null;
	const exc = markChannels(nChan, exclude);
	let n = 0;
	for (let c = 0; c < nChan; c++) if ((inc === null || inc[c] === 1) && exc[c] === 0) n++;
	return n;
}
