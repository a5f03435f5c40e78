import { z } from 'zod';
import type { SavedVersion } from '$lib/server/services/recipes';

export const saveVersionRequestSchema = z.strictObject({
	message: z.string().trim().min(1, 'Say in a few words what changed.').max(500),
	params: z.unknown().optional(),
	base_revision: z.int().positive().optional()
});
export type SaveVersionResponse = SavedVersion;
