import { z } from 'zod';
import { RECIPE_SORTS } from '$lib/server/db/queries/recipes';

export const RECIPES_PAGE_SIZE = 20;

export const recipeListQuerySchema = z.object({
	q: z.string().trim().max(200).default(''),
	sort: z.enum(RECIPE_SORTS).default('updated'),
	dir: z.enum(['asc', 'desc']).default('desc'),
	cursor: z.coerce.number().int().min(0).default(0),
	team: z.uuid().optional()
});
export type RecipeListQuery = z.infer<typeof recipeListQuerySchema>;

export type RecipeListRow = {
	id: string;
	team: string;
	title: string;
	observation: string | null;
	latestVersion: number | null;
	state: string;
	lastEditor: string | null;
	updatedAt: string;
};
export type RecipeListResponse = { items: RecipeListRow[]; nextCursor: number | null; total: number };
