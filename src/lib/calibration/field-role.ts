import { z } from 'zod';

/** The five field roles of DESIGN.md's vocabulary; a field may hold several calibrator roles. */
export const fieldRoleSchema = z.enum([
	'flux_calibrator',
	'bandpass_calibrator',
	'delay_calibrator',
	'gain_calibrator',
	'target'
]);
export type FieldRole = z.infer<typeof fieldRoleSchema>;

export const CALIBRATOR_ROLES: readonly FieldRole[] = [
	'flux_calibrator',
	'bandpass_calibrator',
	'delay_calibrator',
	'gain_calibrator'
];
