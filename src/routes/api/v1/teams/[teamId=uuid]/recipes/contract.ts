import { z } from 'zod';

export const createRecipeRequestSchema = z.strictObject({
	observation_id: z.uuid({ message: 'observation_id must be the id of one of the team\'s observations' }),
	title: z.string().trim().min(1).max(200).optional()
});
export type CreateRecipeResponse = { id: string };
