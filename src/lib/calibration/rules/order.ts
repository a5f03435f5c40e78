import { STEP_ORDER, type StepKind } from '../recipe';
import { listFieldsWithRole } from './context';
import type { Rule, RuleHit } from './types';

const SOURCE_ORDER = 'common practice (order of operations, METHODS.md §13)';

export const stepOutOfOrder: Rule = {
	code: 'order.step_out_of_order',
	severity: 'error',
	locked: true,
	source: SOURCE_ORDER,
	why: 'Each solve needs the earlier corrections applied: delays before the bandpass, the bandpass before the time-variable gains, gains before the flux scale is transferred, and verification last.',
	check(ctx) {
		const hits: RuleHit[] = [];
		let highest = -1;
		let highestKind: StepKind | null = null;
		ctx.recipe.steps.forEach((step, index) => {
			const rank = STEP_ORDER.indexOf(step.kind);
			if (rank < highest && highestKind) {
				hits.push({ path: `steps[${index}].kind`, message: `"${step.kind}" comes after "${highestKind}"; the required order is ${STEP_ORDER.join(' → ')}` });
			} else {
				highest = rank;
				highestKind = step.kind;
			}
		});
		return hits;
	}
};

export const duplicateStep: Rule = {
	code: 'order.duplicate_step',
	severity: 'error',
	locked: true,
	source: 'project choice',
	why: 'A recipe has one step of each kind; list several fields in one step instead of repeating it.',
	check(ctx) {
		return [...ctx.stepsByKind].flatMap(([kind, list]) =>
			list.slice(1).map(({ index }) => ({ path: `steps[${index}]`, message: `a second "${kind}" step (the first is steps[${list[0]?.index}])` }))
		);
	}
};

export const missingInput: Rule = {
	code: 'order.missing_input',
	severity: 'error',
	locked: true,
	source: SOURCE_ORDER,
	why: 'A step can only use solutions that an earlier step produced.',
	check(ctx) {
		const hits: RuleHit[] = [];
		const first = (kind: StepKind) => ctx.stepsByKind.get(kind)?.[0];
		const before = (kind: StepKind, index: number) => {
			const s = first(kind);
			return s !== undefined && s.index < index;
		};
		const bandpass = first('bandpass');
		if (bandpass && bandpass.step.kind === 'bandpass' && !before('delay', bandpass.index) && !bandpass.step.without_delay_reason) {
			hits.push({
				path: `steps[${bandpass.index}]`,
				message: 'the bandpass step has no delay step before it; add one, or say why it is not needed in without_delay_reason',
				why: 'An uncorrected delay is a phase slope across the band; the bandpass would absorb it per channel, and the provisional phase solve would lose coherence across the clean channels.'
			});
		}
		const gain = first('gain');
		if (gain && !before('bandpass', gain.index)) {
			hits.push({ path: `steps[${gain.index}]`, message: 'the gain step has no bandpass step before it', why: 'Gains are solved with the bandpass applied (METHODS.md §6); without it the frequency response leaks into the gains.' });
		}
		const boot = first('flux_bootstrap');
		if (boot) {
			const gainFields = new Set(gain && gain.index < boot.index ? gain.step.fields : []);
			if (!gain || gain.index > boot.index) {
				hits.push({ path: `steps[${boot.index}]`, message: 'the flux_bootstrap step has no gain step before it' });
			} else {
				const fluxCals = listFieldsWithRole(ctx, 'flux_calibrator');
				if (!fluxCals.some((f) => gainFields.has(f))) {
					hits.push({ path: `steps[${gain.index}].fields`, message: `the gain step solves no flux calibrator (${fluxCals.join(', ') || 'none defined'}), so there is no scale to bootstrap from`, why: 'The bootstrap compares gain amplitudes on the flux calibrator with those on each gain calibrator (METHODS.md §7).' });
				}
				boot.step.fields.forEach((f, i) => {
					if (!gainFields.has(f)) hits.push({ path: `steps[${boot.index}].fields[${i}]`, message: `"${f}" is scaled by the bootstrap but the gain step does not solve it` });
				});
			}
		}
		const apply = first('apply');
		if (apply && !before('gain', apply.index)) hits.push({ path: `steps[${apply.index}]`, message: 'the apply step has no gain step before it' });
		const verify = first('verify');
		if (verify && !before('apply', verify.index)) hits.push({ path: `steps[${verify.index}]`, message: 'the verify step has no apply step before it' });
		// Bandpass prep without a bandpass is dead work; a bandpass without prep averages incoherently.
		if (bandpass && !before('bandpass_prep', bandpass.index)) {
			hits.push({ path: `steps[${bandpass.index}]`, message: 'the bandpass step has no bandpass_prep step before it', why: 'Without a provisional phase solve the scan average inside the bandpass solve is not coherent (METHODS.md §5).' });
		}
		return hits;
	}
};
