import { fluxDensity } from '../flux-standards';
import type { Step } from '../recipe';
import { computeAntennaSnr, planSolutionInterval, type IntervalPlan } from '../sensitivity';
import { countUsableChannels, getCentreFreqHz } from '../spectral-window';
import type { SolutionInterval } from '../recipe';
import type { RuleContext } from './types';
import { getScanSpan } from './context';

/** Used when the summary gives no correlator efficiency: 2-bit quantisation, 0.88 (METHODS.md §9, from memory). */
export const ASSUMED_EFFICIENCY = 0.88;
const PARALLEL_HANDS = new Set(['XX', 'YY', 'RR', 'LL']);

export type SolveKind = 'delay' | 'bandpass_prep' | 'bandpass' | 'gain';
export type SolveStep = Extract<Step, { kind: SolveKind }>;

export type SnrEstimate =
	| {
			ok: true;
			snr: number;
			timeS: number;
			fluxJy: number;
			fluxFrom: 'model' | 'estimate';
			channels: number;
			bandwidthHz: number;
			antennas: number;
			correlations: number;
			efficiency: number;
			efficiencyAssumed: boolean;
			/** Shortest whole-integration interval reaching the step's min_snr, against the field's longest scan. */
			plan: IntervalPlan;
			longestScanS: number;
	  }
	| { ok: false; reason: 'no_observation' | 'no_sefd' | 'no_flux' | 'no_scans' | 'no_channels' };

/** Flux density of a field at the window centre: its model, else the user's estimate. */
export function getFieldFlux(ctx: RuleContext, field: string): { fluxJy: number; from: 'model' | 'estimate' } | null {
	const model = ctx.recipe.flux_models.find((m) => m.field === field);
	if (model && ctx.spw) return { fluxJy: fluxDensity(model.model, getCentreFreqHz(ctx.spw)), from: 'model' };
	const estimate = ctx.recipe.flux_estimates.find((e) => e.field === field);
	return estimate ? { fluxJy: estimate.flux_jy, from: 'estimate' } : null;
}

/** Channels a solve sums: clean ones for the provisional phase, one channel for the bandpass, else clean-or-all. */
export function countSolveChannels(ctx: RuleContext, kind: SolveKind): number {
	const spw = ctx.spw;
	if (!spw) return 0;
	const { clean_channels: clean, excluded_channels: excluded } = ctx.recipe;
	if (kind === 'bandpass') return 1;
	if (kind === 'bandpass_prep') return countUsableChannels(spw.n_chan, clean, excluded);
	// Contract: gain and delay sum the clean channels when any are given, all unexcluded channels otherwise.
	return countUsableChannels(spw.n_chan, clean.length > 0 ? clean : null, excluded);
}

/** Data time in one solution of `interval` for a field (an approximation when the interval spans scans). */
export function resolveIntervalS(ctx: RuleContext, interval: SolutionInterval, field: string): number | null {
	const span = getScanSpan(ctx, field);
	const obs = ctx.observation;
	if (!span || !obs) return null;
	const total = (ctx.scansByField.get(field) ?? []).reduce((sum, s) => sum + s.durationS, 0);
	switch (interval.mode) {
		case 'integration':
			return obs.integration_s;
		case 'scan':
			return span.shortest; // the weakest solution decides
		case 'observation':
			return total;
		case 'seconds':
			return interval.seconds <= span.shortest ? interval.seconds : Math.min(interval.seconds, total);
	}
}

/** Expected antenna-based SNR of one solve on one field (radiometer equation, METHODS.md §9). */
export function estimateSolveSnr(ctx: RuleContext, kind: SolveKind, field: string, interval: SolutionInterval, minSnr: number): SnrEstimate {
	const obs = ctx.observation;
	if (!obs || !ctx.spw) return { ok: false, reason: 'no_observation' };
	const sefdJy = obs.array.sefd_jy;
	if (sefdJy === undefined) return { ok: false, reason: 'no_sefd' };
	const flux = getFieldFlux(ctx, field);
	if (!flux) return { ok: false, reason: 'no_flux' };
	const timeS = resolveIntervalS(ctx, interval, field);
	const span = getScanSpan(ctx, field);
	if (timeS === null || !span) return { ok: false, reason: 'no_scans' };
	const channels = countSolveChannels(ctx, kind);
	if (channels === 0) return { ok: false, reason: 'no_channels' };
	const efficiencyAssumed = obs.array.correlator_efficiency === undefined;
	const efficiency = obs.array.correlator_efficiency ?? ASSUMED_EFFICIENCY;
	const correlations = Math.max(1, Math.min(2, obs.correlations.filter((c) => PARALLEL_HANDS.has(c)).length));
	const flagged = new Set(obs.flagged_antennas);
	const antennas = obs.array.antennas.filter((a) => !flagged.has(a.name)).length;
	const bandwidthHz = channels * Math.abs(ctx.spw.chan_width_hz);
	const common = { sefdJy, efficiency, bandwidthHz, correlations, antennas, fluxJy: flux.fluxJy };
	const snr = computeAntennaSnr({ ...common, timeS });
	const plan = planSolutionInterval({ ...common, snr: minSnr, integrationS: obs.integration_s, scanS: span.longest });
	return {
		ok: true,
		snr,
		timeS,
		fluxJy: flux.fluxJy,
		fluxFrom: flux.from,
		channels,
		bandwidthHz,
		antennas,
		correlations,
		efficiency,
		efficiencyAssumed,
		plan,
		longestScanS: span.longest
	};
}

/** Short human description of the inputs, for a finding's message. */
export function describeEstimate(e: Extract<SnrEstimate, { ok: true }>): string {
	const eta = `η_c ${e.efficiency}${e.efficiencyAssumed ? ' (assumed)' : ''}`;
	return `S = ${formatNumber(e.fluxJy)} Jy (${e.fluxFrom === 'model' ? 'flux model' : 'your estimate'}), ${e.channels} channel(s) = ${formatNumber(e.bandwidthHz / 1e6)} MHz, ${e.antennas} antennas, ${e.correlations} correlation(s), ${eta}`;
}

/** Three significant figures, plain. */
export function formatNumber(x: number): string {
	if (!Number.isFinite(x)) return String(x);
	return Number(x.toPrecision(3)).toString();
}
