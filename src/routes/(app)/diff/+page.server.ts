import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { z } from 'zod';
import { getDb } from '$lib/server/db/client';
import { getRecipeVersion } from '$lib/server/db/queries/recipes';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { diffParams, type ParamChange } from '$lib/workflow/diff/param-diff';
import { diffFindings } from '$lib/workflow/diff/findings-diff';
import { diffText, type TextDiff } from '$lib/workflow/diff/text-diff';
import type { Finding } from '$lib/calibration/validate';

// `/diff?from=<recipe>@<version>&to=<recipe>@<version>[&view=split]`: any two versions the
// viewer may see (two versions of a recipe, or a fork against its upstream). Shareable URLs.
const ref = z.string().regex(/^[0-9a-f-]{36}@[1-9][0-9]{0,8}$/, 'Use recipe-id@version, e.g. from=…@1.');
const querySchema = z.object({ from: ref, to: ref, view: z.enum(['unified', 'split']).default('unified') });

export type DiffPageData = {
	from: { recipeId: string; title: string; version: number };
	to: { recipeId: string; title: string; version: number };
	params: ParamChange[];
	findings: { appeared: Finding[]; disappeared: Finding[]; changed: { code: string; path: string; message: string; from: string; to: string }[] };
	text: TextDiff;
	view: 'unified' | 'split';
};

export const load: PageServerLoad = async (event): Promise<DiffPageData> => {
	const parsed = querySchema.safeParse(Object.fromEntries(event.url.searchParams));
	if (!parsed.success) error(400, { message: `This comparison link is not valid: ${parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`, code: 'validation_failed' });
	const side = async (r: string) => {
		const [recipeId, v] = r.split('@') as [string, string];
		const { recipe } = await loadRecipeFor(event, recipeId, 'recipe.view');
		const version = await getRecipeVersion(getDb(), recipe.id, Number(v));
		if (!version) error(404, { message: `"${recipe.title}" has no version ${v}.`, code: 'not_found' });
		return { recipe, version };
	};
	const a = await side(parsed.data.from);
	const b = await side(parsed.data.to);
	const f = diffFindings(a.version.findings, b.version.findings);
	return {
		from: { recipeId: a.recipe.id, title: a.recipe.title, version: a.version.version },
		to: { recipeId: b.recipe.id, title: b.recipe.title, version: b.version.version },
		params: diffParams(a.version.params, b.version.params),
		findings: {
			appeared: f.appeared,
			disappeared: f.disappeared,
			changed: f.severityChanged.map((c) => ({ code: c.after.code, path: c.after.path, message: c.after.message, from: c.from, to: c.to }))
		},
		text: diffText(a.version.program, b.version.program),
		view: parsed.data.view
	};
};
