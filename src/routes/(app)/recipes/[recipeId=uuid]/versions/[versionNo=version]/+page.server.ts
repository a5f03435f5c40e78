import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getRecipeVersion } from '$lib/server/db/queries/recipes';
import { getTemplateVersionById } from '$lib/server/db/queries/templates';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { summariseParams, type ParamSummaryRow } from '$lib/workflow/diff/param-summary';
import { programFilename } from '$lib/script/filename';
import type { Finding } from '$lib/calibration/validate';
import type { StepKind } from '$lib/calibration/recipe';

export type VersionPageData = {
	recipe: { id: string; title: string };
	version: { number: number; message: string; author: string | null; createdAt: string; programSha256: string; paramsSha256: string; template: string };
	summary: ParamSummaryRow[];
	findings: Finding[];
	steps: { kind: StepKind }[];
	program: string;
	filename: string;
};

export const load: PageServerLoad = async (event): Promise<VersionPageData> => {
	const { recipe } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
	const v = await getRecipeVersion(getDb(), recipe.id, Number(event.params.versionNo));
	if (!v) error(404, { message: `This recipe has no version ${event.params.versionNo}.`, code: 'not_found' });
	const template = await getTemplateVersionById(getDb(), v.templateVersionId);
	return {
		recipe: { id: recipe.id, title: recipe.title },
		version: {
			number: v.version,
			message: v.message,
			author: v.authorEmail,
			createdAt: v.createdAt.toISOString(),
			programSha256: v.programSha256,
			paramsSha256: v.paramsSha256,
			template: template ? `${template.templateName}@${template.version}` : 'unknown'
		},
		summary: summariseParams(v.params),
		findings: v.findings,
		steps: v.params.steps.map((s) => ({ kind: s.kind })),
		program: v.program,
		filename: programFilename(v.params.title, v.version)
	};
};
