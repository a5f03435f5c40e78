import { z } from 'zod';
import type { Finding } from '$lib/calibration/validate';

// The recipe is checked against a stored observation (by id) or one sent inline;
// `team_id` picks the team whose rule policy applies.
export const validateRequestSchema = z.strictObject({
	recipe: z.unknown(),
	observation_id: z.uuid().optional(),
	observation: z.unknown().optional(),
	team_id: z.uuid().optional()
});
export type ValidateRequest = z.infer<typeof validateRequestSchema>;
export type ValidateResponse = { findings: Finding[]; errors: number; warnings: number; notes: number };
