import type { ChannelRange } from '../recipe';
import { computeMinimumIntervalS } from '../sensitivity';
import { countUsableChannels } from '../spectral-window';
import { getScanSpan } from './context';
import { estimateSolveSnr, formatNumber } from './snr-model';
import type { Rule, RuleHit } from './types';

type Named = { key: 'clean_channels' | 'excluded_channels'; ranges: readonly ChannelRange[] };
const listRangeSets = (ctx: Parameters<Rule['check']>[0]): Named[] => [
	{ key: 'clean_channels', ranges: ctx.recipe.clean_channels },
	{ key: 'excluded_channels', ranges: ctx.recipe.excluded_channels }
];

export const channelRangeReversed: Rule = {
	code: 'channels.reversed',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'A channel range is inclusive, from start to end, with start ≤ end.',
	check(ctx) {
		return listRangeSets(ctx).flatMap(({ key, ranges }) =>
			ranges.flatMap((r, i) => (r.start > r.end ? [{ path: `${key}[${i}]`, message: `start ${r.start} is after end ${r.end}` }] : []))
		);
	}
};

export const channelRangeOutside: Rule = {
	code: 'channels.out_of_range',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'Channel indices run from 0 to n_chan − 1 of the recipe\'s spectral window.',
	check(ctx) {
		const spw = ctx.spw;
		if (!spw) return [];
		const last = spw.n_chan - 1;
		return listRangeSets(ctx).flatMap(({ key, ranges }) =>
			ranges.flatMap((r, i) =>
				r.end > last || r.start > last ? [{ path: `${key}[${i}]`, message: `channels ${r.start}–${r.end} reach beyond the last channel (${last}) of window ${spw.id}` }] : []
			)
		);
	}
};

function overlaps(a: ChannelRange, b: ChannelRange): boolean {
	return a.start <= b.end && b.start <= a.end;
}

export const cleanOverlapsExcluded: Rule = {
	code: 'channels.clean_overlaps_excluded',
	severity: 'error',
	source: 'common practice (METHODS.md §5)',
	why: 'Clean channels are free of interference by definition; a channel both clean and excluded is a contradiction that usually means a range was mistyped.',
	check(ctx) {
		const hits: RuleHit[] = [];
		ctx.recipe.clean_channels.forEach((c, i) => {
			ctx.recipe.excluded_channels.forEach((e, j) => {
				if (overlaps(c, e)) hits.push({ path: `clean_channels[${i}]`, message: `channels ${Math.max(c.start, e.start)}–${Math.min(c.end, e.end)} are also in excluded_channels[${j}]` });
			});
		});
		return hits;
	}
};

export const rangesOverlap: Rule = {
	code: 'channels.ranges_overlap',
	severity: 'warning',
	source: 'project choice',
	why: 'Overlapping ranges in one list are usually a typing slip; merge them so each channel appears once.',
	check(ctx) {
		const hits: RuleHit[] = [];
		for (const { key, ranges } of listRangeSets(ctx)) {
			ranges.forEach((a, i) => {
				for (let j = 0; j < i; j++) {
					const b = ranges[j];
					if (b && overlaps(a, b)) hits.push({ path: `${key}[${i}]`, message: `overlaps ${key}[${j}] (${b.start}–${b.end})` });
				}
			});
		}
		return hits;
	}
};

export const tooFewCleanChannels: Rule = {
	code: 'channels.too_few_clean',
	severity: 'error',
	source: 'Wrobel & Walker 1999 (radiometer equation, METHODS.md §9)',
	why: 'The provisional phase solve sums the clean channels; too few of them cannot reach the SNR asked even over the longest bandpass-calibrator scan.',
	check(ctx) {
		const prep = ctx.stepsByKind.get('bandpass_prep')?.[0];
		const spw = ctx.spw;
		if (!prep || prep.step.kind !== 'bandpass_prep' || !spw || ctx.recipe.clean_channels.length === 0) return [];
		const hits: RuleHit[] = [];
		for (const field of prep.step.fields) {
			const span = getScanSpan(ctx, field);
			const e = estimateSolveSnr(ctx, 'bandpass_prep', field, { mode: 'seconds', seconds: span?.longest ?? 1 }, prep.step.min_snr);
			if (!e.ok || !span || e.snr >= prep.step.min_snr) continue;
			// Bandwidth needed at the longest scan, from t_min ∝ 1/Δν (METHODS.md §9).
			const chanHz = Math.abs(spw.chan_width_hz);
			const needS = computeMinimumIntervalS({ ...e, sefdJy: ctx.observation?.array.sefd_jy ?? 0, bandwidthHz: chanHz, snr: prep.step.min_snr });
			const needed = Math.ceil(needS / span.longest);
			const available = countUsableChannels(spw.n_chan, null, ctx.recipe.excluded_channels);
			hits.push({
				path: 'clean_channels',
				message: `${e.channels} clean channel(s) give SNR ≈ ${formatNumber(e.snr)} on "${field}" over its longest scan (${formatNumber(span.longest)} s), below ${prep.step.min_snr}; about ${needed} are needed${needed > available ? `, more than the ${available} unexcluded channels` : ''}`
			});
		}
		return hits;
	}
};
