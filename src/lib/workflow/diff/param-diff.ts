import { STEP_ORDER, type RecipeParams, type Step, type StepKind } from '../../calibration/recipe';
import {
	STEP_NOUNS,
	STEP_TITLES,
	formatChannelRange,
	formatChannelRanges,
	formatFluxModel,
	formatInterval,
	formatList,
	formatNumber,
	formatRoles,
	formatTextPreview,
	sortRanges
} from './param-format';

export type ParamChangeKind = 'changed' | 'added' | 'removed';

/**
 * One difference between two versions' parameters. `path` points into the newer version
 * (into the older one for a removal), in the style of a finding's path; `before` and
 * `after` are display values, null where the thing is absent.
 */
export type ParamChange = { path: string; label: string; before: string | null; after: string | null; kind: ParamChangeKind };

const ARROW = ' \u2192 ';
const LONG_LABEL = 160;

function pushValue(out: ParamChange[], path: string, subject: string, before: string | null, after: string | null, shown?: { before: string; after: string }): void {
	if (before === after) return;
	const kind: ParamChangeKind = before === null ? 'added' : after === null ? 'removed' : 'changed';
	const label = `${subject}: ${shown?.before ?? before ?? 'none'}${ARROW}${shown?.after ?? after ?? 'none'}`;
	out.push({ path, label, before, after, kind });
}

type Indexed<T> = { item: T; index: number };
type Pair<T> = { a?: Indexed<T>; b?: Indexed<T> };

/** Pair items of two lists by key; repeated keys pair in order. Newer order first, removals last. */
function pairByKey<T>(a: readonly T[], b: readonly T[], keyOf: (item: T) => string): Pair<T>[] {
	const pending = new Map<string, Indexed<T>[]>();
	a.forEach((item, index) => {
		const key = keyOf(item);
		pending.set(key, [...(pending.get(key) ?? []), { item, index }]);
	});
	const pairs: Pair<T>[] = b.map((item, index) => ({ a: pending.get(keyOf(item))?.shift(), b: { item, index } }));
	for (const rest of pending.values()) for (const left of rest) pairs.push({ a: left });
	return pairs;
}

function orNull(text: string): string | null {
	return text === '' ? null : text;
}

function sameSet(x: readonly string[], y: readonly string[]): boolean {
	return [...new Set(x)].sort().join('\u0000') === [...new Set(y)].sort().join('\u0000');
}

function diffRanges(out: ParamChange[], path: string, subject: string, a: RecipeParams['clean_channels'], b: RecipeParams['clean_channels']): void {
	const before = a.length === 0 ? null : formatChannelRanges(a);
	const after = b.length === 0 ? null : formatChannelRanges(b);
	if (before === after) return;
	if ((before ?? '').length + (after ?? '').length <= LONG_LABEL || before === null || after === null) {
		pushValue(out, path, subject, before, after);
		return;
	}
	// Long interference lists: say which ranges came and went rather than print both lists.
	const beforeSet = new Set(a.map(formatChannelRange));
	const afterSet = new Set(b.map(formatChannelRange));
	const listFew = (ranges: string[]): string => (ranges.length > 8 ? `${ranges.slice(0, 8).join(', ')} and ${ranges.length - 8} more` : ranges.join(', '));
	const added = sortRanges(b).map(formatChannelRange).filter((r) => !beforeSet.has(r));
	const removed = sortRanges(a).map(formatChannelRange).filter((r) => !afterSet.has(r));
	const parts = [added.length > 0 ? `added ${listFew(added)}` : '', removed.length > 0 ? `removed ${listFew(removed)}` : ''].filter(Boolean);
	out.push({ path, label: `${subject}: ${parts.join('; ')}`, before, after, kind: 'changed' });
}

/** The comparable settings of one step: property → [label words, display value, comparison key]. */
function describeStep(step: Step): Map<string, { name: string; value: string; key: string }> {
	const props = new Map<string, { name: string; value: string; key: string }>();
	const set = (prop: string, name: string, value: string, key = value): void => void props.set(prop, { name, value, key });
	set('fields', step.kind === 'apply' ? 'to fields' : 'fields', formatList(step.fields), [...new Set(step.fields)].sort().join('\u0000'));
	if ('interval' in step) set('interval', 'interval', formatInterval(step.interval));
	if ('solve_for' in step) set('solve_for', 'solves for', step.solve_for === 'amplitude_and_phase' ? 'amplitude and phase' : 'phase');
	if ('min_snr' in step) set('min_snr', 'minimum SNR', formatNumber(step.min_snr));
	if ('search_window_ns' in step) set('search_window_ns', 'search window', `\u00b1${formatNumber(step.search_window_ns)} ns`);
	if ('without_delay_reason' in step && step.without_delay_reason !== undefined) {
		set('without_delay_reason', 'reason for solving without delays', formatTextPreview(step.without_delay_reason), step.without_delay_reason);
	}
	if ('max_amplitude_scatter_pct' in step) set('max_amplitude_scatter_pct', 'amplitude scatter limit', `${formatNumber(step.max_amplitude_scatter_pct)} %`);
	if ('max_phase_rms_deg' in step) set('max_phase_rms_deg', 'phase rms limit', `${formatNumber(step.max_phase_rms_deg)}\u00b0`);
	return props;
}

function diffStepPair(out: ParamChange[], kind: StepKind, a: Indexed<Step>, b: Indexed<Step>): void {
	const before = describeStep(a.item);
	const after = describeStep(b.item);
	for (const prop of new Set([...before.keys(), ...after.keys()])) {
		const x = before.get(prop);
		const y = after.get(prop);
		if (x && y && x.key === y.key) continue;
		const name = (y ?? x)?.name ?? prop;
		const path = y ? `steps[${b.index}].${prop}` : `steps[${a.index}].${prop}`;
		pushValue(out, path, `${STEP_TITLES[kind]} ${name}`, x?.value ?? null, y?.value ?? null);
	}
}

function diffSteps(out: ParamChange[], a: readonly Step[], b: readonly Step[]): void {
	const pairs = pairByKey(a, b, (s) => s.kind);
	const rank = (kind: StepKind): number => STEP_ORDER.indexOf(kind);
	pairs.sort((p, q) => rank((p.b ?? p.a)?.item.kind ?? 'delay') - rank((q.b ?? q.a)?.item.kind ?? 'delay'));
	for (const { a: x, b: y } of pairs) {
		if (x && y) diffStepPair(out, x.item.kind, x, y);
		else if (y) out.push({ path: `steps[${y.index}]`, label: `Step added: ${STEP_NOUNS[y.item.kind]}`, before: null, after: STEP_NOUNS[y.item.kind], kind: 'added' });
		else if (x) out.push({ path: `steps[${x.index}]`, label: `Step removed: ${STEP_NOUNS[x.item.kind]}`, before: STEP_NOUNS[x.item.kind], after: null, kind: 'removed' });
	}
	// Steps are matched by kind, so a reordering shows only here.
	const shared = new Set(a.map((s) => s.kind).filter((k) => b.some((s) => s.kind === k)));
	const orderA = a.map((s) => s.kind).filter((k) => shared.has(k));
	const orderB = b.map((s) => s.kind).filter((k) => shared.has(k));
	if (orderA.join() !== orderB.join()) {
		const show = (steps: readonly Step[]): string => steps.map((s) => STEP_NOUNS[s.kind]).join(', ');
		out.push({ path: 'steps', label: `Step order: ${show(a)}${ARROW}${show(b)}`, before: show(a), after: show(b), kind: 'changed' });
	}
}

/** Every difference between two versions' parameters, in plain words, in the order a reviewer reads a recipe. */
export function diffParams(a: RecipeParams, b: RecipeParams): ParamChange[] {
	const out: ParamChange[] = [];
	pushValue(out, 'title', 'Title', a.title, b.title, { before: formatTextPreview(a.title, 80), after: formatTextPreview(b.title, 80) });
	pushValue(out, 'notes', 'Notes', orNull(a.notes), orNull(b.notes), { before: a.notes ? formatTextPreview(a.notes) : 'none', after: b.notes ? formatTextPreview(b.notes) : 'none' });
	pushValue(out, 'spectral_window_id', 'Spectral window', String(a.spectral_window_id), String(b.spectral_window_id));

	for (const { a: x, b: y } of pairByKey(a.fields, b.fields, (f) => f.name)) {
		if (x && y) {
			if (!sameSet(x.item.roles, y.item.roles)) pushValue(out, `fields[${y.index}].roles`, `Field roles of ${y.item.name}`, formatRoles(x.item.roles), formatRoles(y.item.roles));
		} else if (y) {
			const value = `${y.item.name} (${formatRoles(y.item.roles)})`;
			out.push({ path: `fields[${y.index}]`, label: `Field added: ${value}`, before: null, after: value, kind: 'added' });
		} else if (x) {
			const value = `${x.item.name} (${formatRoles(x.item.roles)})`;
			out.push({ path: `fields[${x.index}]`, label: `Field removed: ${value}`, before: value, after: null, kind: 'removed' });
		}
	}

	for (const { a: x, b: y } of pairByKey(a.flux_models, b.flux_models, (m) => m.field)) {
		const field = (y ?? x)?.item.field ?? '';
		const path = y ? `flux_models[${y.index}].model` : `flux_models[${x?.index ?? 0}]`;
		pushValue(out, path, `Flux model of ${field}`, x ? formatFluxModel(x.item.model, field) : null, y ? formatFluxModel(y.item.model, field) : null);
	}
	for (const { a: x, b: y } of pairByKey(a.flux_estimates, b.flux_estimates, (e) => e.field)) {
		const field = (y ?? x)?.item.field ?? '';
		const path = y ? `flux_estimates[${y.index}].flux_jy` : `flux_estimates[${x?.index ?? 0}]`;
		const show = (jy: number): string => `${formatNumber(jy)} Jy`;
		pushValue(out, path, `Flux estimate of ${field}`, x ? show(x.item.flux_jy) : null, y ? show(y.item.flux_jy) : null);
	}

	for (const { a: x, b: y } of pairByKey(a.targets, b.targets, (t) => t.field)) {
		if (x && y) {
			pushValue(out, `targets[${y.index}].gain_calibrator`, `Gain calibrator of ${y.item.field}`, x.item.gain_calibrator, y.item.gain_calibrator);
			pushValue(out, `targets[${y.index}].interpolation`, `Interpolation for ${y.item.field}`, x.item.interpolation, y.item.interpolation);
			continue;
		}
		const t = y ?? x;
		if (!t) continue;
		const value = `${t.item.field} (gain calibrator ${t.item.gain_calibrator}, ${t.item.interpolation} interpolation)`;
		if (y) out.push({ path: `targets[${y.index}]`, label: `Target added: ${value}`, before: null, after: value, kind: 'added' });
		else out.push({ path: `targets[${t.index}]`, label: `Target removed: ${value}`, before: value, after: null, kind: 'removed' });
	}

	pushValue(out, 'reference_antenna.primary', 'Reference antenna', a.reference_antenna.primary, b.reference_antenna.primary);
	const fallbacks = (list: readonly string[]): string | null => (list.length === 0 ? null : formatList(list));
	pushValue(out, 'reference_antenna.fallbacks', 'Fallback reference antennas', fallbacks(a.reference_antenna.fallbacks), fallbacks(b.reference_antenna.fallbacks));
	diffRanges(out, 'clean_channels', 'Clean channels', a.clean_channels, b.clean_channels);
	diffRanges(out, 'excluded_channels', 'Excluded channels', a.excluded_channels, b.excluded_channels);
	diffSteps(out, a.steps, b.steps);
	return out;
}
