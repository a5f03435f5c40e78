import { z } from 'zod';

export const renderRequestSchema = z.strictObject({
	recipe: z.unknown(),
	observation_id: z.uuid().optional(),
	observation: z.unknown().optional(),
	team_id: z.uuid().optional(),
	template: z.strictObject({ name: z.string().min(1).max(100), version: z.int().positive().optional() }).optional()
});
export type RenderRequest = z.infer<typeof renderRequestSchema>;
export type RenderResponse = { program: string; sha256: string; template: { name: string; version: number; sha256: string } };
