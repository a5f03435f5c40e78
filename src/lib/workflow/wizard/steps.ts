// The recipe wizard's screens, in order, with what each one edits (DESIGN.md vocabulary).
export const WIZARD_STEPS = ['observation', 'roles', 'flux', 'reference', 'channels', 'solve', 'review'] as const;
export type WizardStep = (typeof WIZARD_STEPS)[number];

export const WIZARD_LABELS: Readonly<Record<WizardStep, { title: string; summary: string }>> = {
	observation: { title: 'Observation', summary: 'The observation summary this recipe plans for' },
	roles: { title: 'Field roles', summary: 'Which field calibrates what, and each target\'s gain calibrator' },
	flux: { title: 'Flux model', summary: 'The flux-density model of each flux calibrator' },
	reference: { title: 'Reference antenna', summary: 'The antenna whose phase is zero, and its fallbacks' },
	channels: { title: 'Channels', summary: 'Clean channels for the provisional phase solve; channels to exclude' },
	solve: { title: 'Solve chain', summary: 'Intervals, what is solved for, and minimum SNR of each step' },
	review: { title: 'Review', summary: 'Findings and the rendered program; save a version' }
};

/** The step after `step`, or null at the end. */
export function nextStep(step: WizardStep): WizardStep | null {
	return WIZARD_STEPS[WIZARD_STEPS.indexOf(step) + 1] ?? null;
}

/** The step before `step`, or null at the start. */
export function previousStep(step: WizardStep): WizardStep | null {
	const i = WIZARD_STEPS.indexOf(step);
	return i > 0 ? (WIZARD_STEPS[i - 1] ?? null) : null;
}

/** The wizard screen that edits a finding's path (for "jump to the field it names"). */
export function stepForPath(path: string): WizardStep {
	if (/^(fields|targets)\b/.test(path)) return 'roles';
	if (/^(flux_models|flux_estimates)\b/.test(path)) return 'flux';
	if (/^reference_antenna\b/.test(path)) return 'reference';
	if (/^(clean_channels|excluded_channels)\b/.test(path)) return 'channels';
	if (/^steps\b/.test(path)) return 'solve';
	if (/^spectral_window_id\b/.test(path)) return 'observation';
	return 'review';
}
