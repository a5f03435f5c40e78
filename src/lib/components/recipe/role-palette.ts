import type { FieldRole } from '$lib/calibration/field-role';

/** A field's colour key: its leading role, or `unassigned` before roles are set. */
export type RoleKey = FieldRole | 'unassigned';

export type RoleStyle = {
	label: string;
	/** SVG fill classes for both themes (Tailwind scans this file, so the classes are static strings). */
	fillClass: string;
	/** Background classes for legend swatches. */
	swatchClass: string;
};

/** Order used to pick a field's leading role and to order rows and legends. */
export const ROLE_PRIORITY: readonly FieldRole[] = ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator', 'gain_calibrator', 'target'];

/*
 * Phasewright's own role palette (project choice): five hues that stay apart for common colour-vision deficiencies
 * on both themes, none of them amber or rose, which are kept for warnings and errors. Labels and legends always
 * carry the role in words too, so colour is never the only cue.
 */
export const ROLE_STYLES: Readonly<Record<RoleKey, RoleStyle>> = {
	flux_calibrator: { label: 'Flux calibrator', fillClass: 'fill-indigo-600 dark:fill-indigo-400', swatchClass: 'bg-indigo-600 dark:bg-indigo-400' },
	bandpass_calibrator: { label: 'Bandpass calibrator', fillClass: 'fill-teal-600 dark:fill-teal-400', swatchClass: 'bg-teal-600 dark:bg-teal-400' },
	delay_calibrator: { label: 'Delay calibrator', fillClass: 'fill-fuchsia-700 dark:fill-fuchsia-400', swatchClass: 'bg-fuchsia-700 dark:bg-fuchsia-400' },
	gain_calibrator: { label: 'Gain calibrator', fillClass: 'fill-sky-600 dark:fill-sky-400', swatchClass: 'bg-sky-600 dark:bg-sky-400' },
	target: { label: 'Target', fillClass: 'fill-lime-700 dark:fill-lime-500', swatchClass: 'bg-lime-700 dark:bg-lime-500' },
	unassigned: { label: 'No role yet', fillClass: 'fill-ink-500 dark:fill-ink-300', swatchClass: 'bg-ink-500 dark:bg-ink-300' }
};

/** The role that decides a field's colour: the first of its roles in `ROLE_PRIORITY`. */
export function pickLeadingRole(roles: readonly FieldRole[] | undefined): RoleKey {
	if (!roles) return 'unassigned';
	return ROLE_PRIORITY.find((r) => roles.includes(r)) ?? 'unassigned';
}

/** Roles in words, e.g. "Flux calibrator, Bandpass calibrator". */
export function describeRoles(roles: readonly FieldRole[] | undefined): string {
	const sorted = ROLE_PRIORITY.filter((r) => roles?.includes(r));
	return sorted.length === 0 ? ROLE_STYLES.unassigned.label : sorted.map((r) => ROLE_STYLES[r].label).join(', ');
}
