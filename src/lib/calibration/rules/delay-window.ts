import { computeUnambiguousDelayNs } from '../sensitivity';
import type { Rule } from './types';

export const TYPICAL_DELAY_WINDOW_NS = 100;

export const delayWindowAmbiguous: Rule = {
	code: 'delay.window_beyond_unambiguous',
	severity: 'error',
	source: 'METHODS.md §2 (sampling of the phase slope)',
	why: 'With channel spacing Δν a delay is only determined modulo 1/|Δν|: delays beyond ±1/(2|Δν|) alias, so a wider search window cannot be honoured.',
	check(ctx) {
		const d = ctx.stepsByKind.get('delay')?.[0];
		if (!d || d.step.kind !== 'delay' || !ctx.spw) return [];
		const limit = computeUnambiguousDelayNs(ctx.spw.chan_width_hz);
		return d.step.search_window_ns > limit
			? [{ path: `steps[${d.index}].search_window_ns`, message: `±${d.step.search_window_ns} ns exceeds the unambiguous range ±${limit.toFixed(1)} ns of ${Math.abs(ctx.spw.chan_width_hz) / 1e3} kHz channels` }]
			: [];
	}
};

export const delayWindowWide: Rule = {
	code: 'delay.window_wide',
	severity: 'warning',
	source: 'common practice',
	why: `Residual delays after the correlator's model are typically a few ns; a window much wider than ~${TYPICAL_DELAY_WINDOW_NS} ns lets noise peaks be picked on weak baselines.`,
	check(ctx) {
		const d = ctx.stepsByKind.get('delay')?.[0];
		if (!d || d.step.kind !== 'delay' || d.step.search_window_ns <= TYPICAL_DELAY_WINDOW_NS) return [];
		return [{ path: `steps[${d.index}].search_window_ns`, message: `±${d.step.search_window_ns} ns is much wider than the typical residual delay (a few ns)` }];
	}
};
