import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { z } from 'zod';
import { getDb } from '$lib/server/db/client';
import { getObservation } from '$lib/server/db/queries/observations';
import { listRecipeVersions } from '$lib/server/db/queries/recipes';
import { listVersionStates } from '$lib/server/db/queries/reviews';
import { actorOf, requireCan } from '$lib/server/guards';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { getShare, shareRecipe, withdrawShare } from '$lib/server/services/sharing';
import { forkVersion, getCompareTarget, getLineage } from '$lib/server/services/forks';
import { moveRecipeToTemplate } from '$lib/server/services/template-editing';
import { getTemplateVersionById, listTemplateVersions } from '$lib/server/db/queries/templates';
import { countFindings } from '$lib/components/recipe/findings-groups';
import { can } from '$lib/workflow/permissions';
import type { ReviewState } from '$lib/workflow/review-state';
import { statusFor } from '$lib/server/http';

export type RecipePageData = {
	recipe: { id: string; title: string; teamId: string; revision: number; updatedAt: string };
	observation: { id: string; name: string } | null;
	versions: { version: number; message: string; author: string | null; createdAt: string; programSha256: string; errors: number; warnings: number; notes: number; state: ReviewState }[];
	canEdit: boolean;
	canShare: boolean;
	shared: { at: string; by: string | null } | null;
	lineage: { recipeId: string; title: string; teamName: string; version: number | null }[];
	upstreamCompare: { href: string; text: string } | null;
	forkTeams: { id: string; name: string }[];
	template: { current: string; choices: { id: string; label: string }[] } | null;
};

export const load: PageServerLoad = async (event): Promise<RecipePageData> => {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
	const actor = actorOf(user);
	const db = getDb();
	const obs = recipe.observationId ? await getObservation(db, recipe.observationId) : null;
	const versions = await listRecipeVersions(db, recipe.id);
	const states = new Map((await listVersionStates(db, recipe.id)).map((s) => [s.version, s.state]));
	const share = await getShare(db, recipe.id);
	const lineage = await getLineage(db, recipe.id, { viewerId: user.id });
	const target = await getCompareTarget(db, recipe.id, { viewerId: user.id });
	const latest = versions[0]?.version ?? null;
	const pinned = versions[0] ? await getTemplateVersionById(db, versions[0].templateVersionId) : null;
	const canEdit = can(actor, 'recipe.edit', { teamId: recipe.teamId });
	const choices = pinned && canEdit ? (await listTemplateVersions(db, [recipe.teamId])).filter((t) => t.id !== pinned.id && (t.teamId === null || t.teamId === recipe.teamId)) : [];
	return {
		recipe: { id: recipe.id, title: recipe.title, teamId: recipe.teamId, revision: recipe.draftRevision, updatedAt: recipe.updatedAt.toISOString() },
		observation: obs ? { id: obs.id, name: obs.name } : null,
		versions: versions.map((v) => {
			const c = countFindings(v.findings);
			return { version: v.version, message: v.message, author: v.authorEmail, createdAt: v.createdAt.toISOString(), programSha256: v.programSha256, errors: c.error, warnings: c.warning, notes: c.note, state: states.get(v.version) ?? 'draft' };
		}),
		canEdit,
		canShare: can(actor, 'recipe.share', { teamId: recipe.teamId }),
		shared: share ? { at: share.sharedAt.toISOString(), by: share.sharedByEmail } : null,
		// chain[i] was forked from chain[i + 1] at chain[i].forkedFrom.version.
		lineage: lineage.ok ? lineage.value.chain.slice(1).map((e, i) => ({ recipeId: e.recipeId, title: e.title, teamName: e.teamName, version: lineage.value.chain[i]?.forkedFrom?.version ?? null })) : [],
		upstreamCompare:
			target.ok && target.value && latest !== null
				? {
						href: `/diff?from=${target.value.recipeId}@${target.value.version}&to=${recipe.id}@${latest}`,
						text: `Compare with upstream (${target.value.reason === 'newest_approved' ? 'its newest approved version' : 'the version this fork was made from'}, v${target.value.version})`
					}
				: null,
		template: pinned ? { current: `${pinned.templateName}@${pinned.version}`, choices: choices.map((t) => ({ id: t.id, label: `${t.templateName}@${t.version}${t.teamId === null ? ' (starter set)' : ''} — ${t.changelog}` })) } : null,
		forkTeams: share ? user.memberships.filter((m) => m.teamId !== recipe.teamId && can(actor, 'recipe.create', { teamId: m.teamId })).map((m) => ({ id: m.teamId, name: m.teamName })) : []
	};
};

const moveSchema = z.object({ template_version: z.uuid('Choose a template version.'), message: z.string().trim().max(500).default('') });

const forkSchema = z.object({ team: z.uuid('Choose the team to fork into.'), version: z.coerce.number().int().positive('Choose a version.') });

export const actions: Actions = {
	share: async (event) => {
		const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.share');
		const r = await shareRecipe(getDb(), { recipeId: recipe.id, userId: user.id });
		return r.ok ? { done: 'Shared with all teams: they can read it and fork it.' } : fail(statusFor(r.error.code), { problem: r.error.message });
	},
	withdraw: async (event) => {
		const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.share');
		const r = await withdrawShare(getDb(), { recipeId: recipe.id, userId: user.id });
		return r.ok ? { done: 'No longer shared. Forks already made keep their copy.' } : fail(400, { problem: r.error.message });
	},
	moveTemplate: async (event) => {
		const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.edit');
		const form = await event.request.formData();
		const parsed = moveSchema.safeParse({ template_version: form.get('template_version') ?? '', message: form.get('message') ?? '' });
		if (!parsed.success) return fail(400, { problem: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await moveRecipeToTemplate(getDb(), { recipeId: recipe.id, templateVersionId: parsed.data.template_version, userId: user.id, message: parsed.data.message });
		if (!r.ok) return fail(statusFor(r.error.code), { problem: r.error.message });
		redirect(303, `/recipes/${recipe.id}/versions/${r.value.version}`);
	},
	fork: async (event) => {
		const { recipe } = await loadRecipeFor(event, event.params.recipeId, 'recipe.fork');
		const form = await event.request.formData();
		const parsed = forkSchema.safeParse({ team: form.get('team') ?? '', version: form.get('version') ?? '' });
		if (!parsed.success) return fail(400, { problem: parsed.error.issues.map((i) => i.message).join(' ') });
		const user = requireCan(event, 'recipe.create', { teamId: parsed.data.team }, 'team.view');
		const r = await forkVersion(getDb(), { sourceRecipeId: recipe.id, version: parsed.data.version, targetTeamId: parsed.data.team, userId: user.id });
		if (!r.ok) return fail(statusFor(r.error.code), { problem: r.error.message });
		redirect(303, `/recipes/${r.value.recipeId}`);
	}
};
