import type { Executor } from '../db/client';
import { inResultTransaction } from '../db/transaction';
import { getRulePolicy } from '../db/queries/teams';
import { findObservationBySha, getObservation } from '../db/queries/observations';
import { getLatestVersionNumber, getRecipe, getRecipeVersion, insertRecipe, insertRecipeVersion, setRecipeObservation, updateDraft } from '../db/queries/recipes';
import { getTemplateVersionById } from '../db/queries/templates';
import { createDefaultRecipe } from '$lib/calibration/defaults';
import { createRecipeExport, parseRecipeExport, parseRecipeParamsValue, type RecipeExport, type RecipeParams } from '$lib/calibration/recipe';
import { hasErrors, validate, type Finding } from '$lib/calibration/validate';
import { paramsSha256, textSha256 } from '$lib/script/sha256';
import { programFilename } from '$lib/script/filename';
import { uploadObservation } from './observations';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { syncStarterTemplates } from './templates';
import { STARTER_FILES, STARTER_TEMPLATE_NAME } from '../templates/starter';
import { renderWithTemplate } from './render';
import { recordAudit } from './audit';

/** The refusal for an edit based on an older draft revision than the stored one. */
function staleRevision(base: number, current: number) {
	return fail('conflict', `Someone else saved this recipe after you opened it (you edited revision ${base}, it is now at ${current}). Reload to see their changes; your edit was not saved.`);
}

/** Creates a recipe for one of the team's observations, starting from the engine's defaults. */
export async function createRecipe(db: Executor, input: { teamId: string; observationId: string; title?: string; userId: string | null }): Promise<DomainResult<{ id: string }>> {
	return inResultTransaction(db, async (tx) => {
		const obs = await getObservation(tx, input.observationId);
		if (!obs || obs.teamId !== input.teamId) return fail('not_found', 'No such observation in this team.');
		const draft = createDefaultRecipe(obs.summary, input.title ? { title: input.title } : {});
		const row = await insertRecipe(tx, { teamId: input.teamId, title: draft.title, observationId: obs.id, draft, userId: input.userId });
		await recordAudit(tx, { teamId: input.teamId, actorId: input.userId, action: 'recipe.create', subjectType: 'recipe', subjectId: row.id, details: { title: draft.title, observation: obs.name } });
		return { ok: true, value: row };
	});
}

export type SavedVersion = { version: number; programSha256: string; paramsSha256: string; findings: Finding[]; template: { name: string; version: number } };

/**
 * Saves the draft (or the given parameters) as a new immutable version: validated, rendered
 * with the template version it pins, stored in one transaction. Error findings refuse the
 * save and keep the draft; a stale `baseRevision` is a conflict, never a silent overwrite.
 */
export async function saveVersion(
	db: Executor,
	input: { recipeId: string; userId: string | null; message: string; params?: unknown; baseRevision?: number; now: Date }
): Promise<DomainResult<SavedVersion>> {
	return inResultTransaction(db, async (tx) => {
		// Inside the transaction, so the pinned template version is one this transaction can see.
		const { version: template } = await syncStarterTemplates(tx, STARTER_TEMPLATE_NAME, STARTER_FILES);
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe) return fail('not_found', 'No such recipe.');
		if (input.baseRevision !== undefined && input.baseRevision !== recipe.draftRevision) {
			return staleRevision(input.baseRevision, recipe.draftRevision);
		}
		let params = recipe.draft;
		if (input.params !== undefined) {
			const parsed = parseRecipeParamsValue(input.params);
			if (!parsed.ok) return fail('validation_failed', 'The recipe parameters are not valid.', parsed.error.issues);
			params = parsed.value;
		}
		const observation = recipe.observationId ? ((await getObservation(tx, recipe.observationId))?.summary ?? null) : null;
		const findings = validate(params, observation, await getRulePolicy(tx, recipe.teamId));
		if (hasErrors(findings)) {
			const errors = findings.filter((f) => f.severity === 'error');
			return fail('validation_failed', `The recipe has ${errors.length} error finding${errors.length === 1 ? '' : 's'}; fix them before saving a version (the draft is kept).`, errors.map((f) => ({ path: f.path, message: `${f.code}: ${f.message}` })));
		}
		const version = (await getLatestVersionNumber(tx, recipe.id)) + 1;
		const rendered = renderWithTemplate({ template, recipe: params, observation, recipeId: recipe.id, recipeVersion: version });
		if (!rendered.ok) return rendered;
		const pSha = paramsSha256(params);
		const saved = await insertRecipeVersion(tx, {
			recipeId: recipe.id,
			version,
			params,
			paramsSha256: pSha,
			templateVersionId: template.id,
			program: rendered.value.program,
			programSha256: rendered.value.sha256,
			findings,
			message: input.message,
			authorId: input.userId
		});
		await updateDraft(tx, recipe.id, { draft: params, title: params.title, revision: recipe.draftRevision + 1, userId: input.userId, now: input.now });
		await recordAudit(tx, { teamId: recipe.teamId, actorId: input.userId, action: 'version.save', subjectType: 'recipe_version', subjectId: saved.id, details: { recipe_id: recipe.id, version, message: input.message, template: `${template.templateName}@${template.version}` }, now: input.now });
		return { ok: true, value: { version, programSha256: rendered.value.sha256, paramsSha256: pSha, findings, template: { name: template.templateName, version: template.version } } };
	});
}

/** Re-renders a saved version with the template version it pinned (must equal the stored program). */
export async function rerenderVersion(db: Executor, v: { recipeId: string; version: number; params: RecipeParams; templateVersionId: string; observationId: string | null }): Promise<DomainResult<string>> {
	const template = await getTemplateVersionById(db, v.templateVersionId);
	if (!template) return fail('not_found', 'The pinned template version is missing.');
	const observation = v.observationId ? ((await getObservation(db, v.observationId))?.summary ?? null) : null;
	const r = renderWithTemplate({ template, recipe: v.params, observation, recipeId: v.recipeId, recipeVersion: v.version });
	return r.ok ? { ok: true, value: r.value.program } : r;
}

/**
 * Saves the working draft (never blocked by findings). `baseRevision` must match the stored
 * revision: a second editor with a stale copy gets a conflict instead of overwriting.
 */
export async function saveDraft(db: Executor, input: { recipeId: string; baseRevision: number; params: unknown; userId: string | null; now: Date }): Promise<DomainResult<{ revision: number }>> {
	const parsed = parseRecipeParamsValue(input.params);
	if (!parsed.ok) return fail('validation_failed', 'The draft does not fit the recipe format.', parsed.error.issues);
	return inResultTransaction(db, async (tx) => {
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe) return fail('not_found', 'No such recipe.');
		if (recipe.draftRevision !== input.baseRevision) {
			return staleRevision(input.baseRevision, recipe.draftRevision);
		}
		const revision = recipe.draftRevision + 1;
		await updateDraft(tx, recipe.id, { draft: parsed.value, title: parsed.value.title, revision, userId: input.userId, now: input.now });
		return { ok: true, value: { revision } };
	});
}

/**
 * Imports a `phasewright.recipe` export into a team as a new recipe (never overwriting one).
 * Its embedded observation is stored as the team's observation, or reused when the team
 * already has the same summary.
 */
export async function importRecipe(db: Executor, input: { teamId: string; text: string; filename: string; userId: string | null }): Promise<DomainResult<{ id: string }>> {
	const parsed = parseRecipeExport(input.text);
	if (!parsed.ok) return fail('validation_failed', `${input.filename} is not a phasewright.recipe v1 export.`, parsed.error.issues);
	const exp = parsed.value;
	return inResultTransaction(db, async (tx) => {
		const bytes = new TextEncoder().encode(`${JSON.stringify(exp.observation, null, 2)}\n`);
		const uploaded = await uploadObservation(tx, { teamId: input.teamId, bytes, filename: `${input.filename} (embedded observation)`, userId: input.userId });
		let observationId: string;
		if (uploaded.ok) observationId = uploaded.value.id;
		else {
			const existing = uploaded.error.code === 'conflict' ? await findObservationBySha(tx, input.teamId, textSha256(new TextDecoder().decode(bytes))) : null;
			if (!existing) return uploaded;
			observationId = existing.id;
		}
		const row = await insertRecipe(tx, { teamId: input.teamId, title: exp.recipe.title, observationId, draft: exp.recipe, userId: input.userId });
		await recordAudit(tx, { teamId: input.teamId, actorId: input.userId, action: 'recipe.import', subjectType: 'recipe', subjectId: row.id, details: { title: exp.recipe.title, file: input.filename } });
		return { ok: true, value: row };
	});
}

/** The `phasewright.recipe` v1 export of a saved version. */
export async function exportVersion(db: Executor, recipeId: string, version: number): Promise<DomainResult<{ export: RecipeExport; filename: string }>> {
	const recipe = await getRecipe(db, recipeId);
	const v = recipe ? await getRecipeVersion(db, recipeId, version) : null;
	if (!recipe || !v) return fail('not_found', 'No such recipe version.');
	const obs = recipe.observationId ? await getObservation(db, recipe.observationId) : null;
	if (!obs) return fail('not_found', 'The observation of this recipe is no longer stored, so it cannot be exported with it.');
	const template = await getTemplateVersionById(db, v.templateVersionId);
	if (!template) return fail('internal', 'The pinned template version is missing.');
	return {
		ok: true,
		value: {
			export: createRecipeExport({ title: v.params.title, observation: obs.summary, recipe: v.params, template: { name: template.templateName, version: template.version } }),
			filename: programFilename(v.params.title, v.version).replace(/\.py$/, '.recipe.json')
		}
	};
}

/**
 * Points the draft at another of the team's observations and starts its parameters afresh from
 * that observation's defaults (keeping the title and notes). Same revision check as saveDraft.
 */
export async function changeObservation(db: Executor, input: { recipeId: string; observationId: string; baseRevision: number; userId: string | null; now: Date }): Promise<DomainResult<{ revision: number }>> {
	return inResultTransaction(db, async (tx) => {
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe) return fail('not_found', 'No such recipe.');
		if (recipe.draftRevision !== input.baseRevision) {
			return staleRevision(input.baseRevision, recipe.draftRevision);
		}
		if (recipe.observationId === input.observationId) return { ok: true, value: { revision: recipe.draftRevision } };
		const obs = await getObservation(tx, input.observationId);
		if (!obs || obs.teamId !== recipe.teamId) return fail('not_found', 'No such observation in this team.');
		const fresh = createDefaultRecipe(obs.summary, { title: recipe.draft.title });
		const revision = recipe.draftRevision + 1;
		await setRecipeObservation(tx, recipe.id, obs.id);
		await updateDraft(tx, recipe.id, { draft: { ...fresh, notes: recipe.draft.notes }, title: fresh.title, revision, userId: input.userId, now: input.now });
		return { ok: true, value: { revision } };
	});
}
