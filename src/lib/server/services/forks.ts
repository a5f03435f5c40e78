import type { Executor } from '../db/client';
import { findObservationBySha, getObservation, getObservationBytes } from '../db/queries/observations';
import { getRecipe, getRecipeVersion, insertRecipe, insertRecipeVersion } from '../db/queries/recipes';
import { listVersionStates } from '../db/queries/reviews';
import { getRecipeLineageRow, getRecipeShare, setRecipeForkedFrom, type RecipeLineageRow } from '../db/queries/sharing';
import { getRulePolicy, getTeam, listMembers } from '../db/queries/teams';
import { getTemplateVersionById } from '../db/queries/templates';
import { hasErrors, validate } from '$lib/calibration/validate';
import { paramsSha256 } from '$lib/script/sha256';
import { can, type Actor } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { findCompareTarget, traceLineage, type CompareTarget, type ForkLink, type LineageEntry } from '$lib/workflow/lineage';
import { displayNameOf, loadActor, recordAudit } from './audit';
import { inResultTransaction } from '../db/transaction';
import { queueNotifications } from './notifications';
import { uploadObservation } from './observations';
import { renderWithTemplate } from './render';

export type ForkResult = { recipeId: string; version: number; templateVersionId: string; observationId: string | null; notified: number };

// The observation goes into the target team as the same bytes, so its SHA-256 (and the
// programs rendered from it) match the source; a team that has the file already reuses it.
async function copyObservation(tx: Executor, observationId: string | null, targetTeamId: string, userId: string): Promise<DomainResult<string | null>> {
	if (observationId === null) return { ok: true, value: null };
	const source = await getObservation(tx, observationId);
	const bytes = await getObservationBytes(tx, observationId);
	if (!source || !bytes) return { ok: true, value: null };
	if (source.teamId === targetTeamId) return { ok: true, value: source.id };
	const uploaded = await uploadObservation(tx, { teamId: targetTeamId, bytes: new Uint8Array(bytes), filename: source.originalFilename, userId });
	if (uploaded.ok) return { ok: true, value: uploaded.value.id };
	if (uploaded.error.code !== 'conflict') return uploaded;
	const existing = await findObservationBySha(tx, targetTeamId, source.sha256);
	if (!existing) return fail('internal', 'The observation was reported as uploaded before, but it could not be found in the team.');
	return { ok: true, value: existing.id };
}

/**
 * Forks one saved version of a shared recipe (or one of the actor's own team) into the
 * target team: a new recipe whose version 1 has the same parameters and the SAME pinned
 * template version as the source, with `forked_from` recorded. One transaction.
 */
export async function forkVersion(
	db: Executor,
	input: { sourceRecipeId: string; version: number; targetTeamId: string; userId: string; now?: Date }
): Promise<DomainResult<ForkResult>> {
	const now = input.now ?? new Date();
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to fork recipes.');
		const source = await getRecipe(tx, input.sourceRecipeId);
		const shared = source ? (await getRecipeShare(tx, source.id)) !== null : false;
		if (!source || !can(acting.actor, 'recipe.view', { teamId: source.teamId, shared })) return fail('not_found', 'No such recipe, or it is not shared with your teams.');
		if (!can(acting.actor, 'recipe.fork', { teamId: source.teamId, shared })) return fail('forbidden', 'You cannot fork this recipe.');
		const targetTeam = await getTeam(tx, input.targetTeamId);
		if (!targetTeam || !can(acting.actor, 'recipe.create', { teamId: targetTeam.id })) {
			return fail('forbidden', 'You can fork only into a team you are a member of; choose one of your teams.');
		}
		const sourceVersion = await getRecipeVersion(tx, source.id, input.version);
		if (!sourceVersion) return fail('not_found', `"${source.title}" has no version ${input.version}.`);
		const template = await getTemplateVersionById(tx, sourceVersion.templateVersionId);
		if (!template) return fail('internal', `The template version pinned by "${source.title}" v${input.version} is missing, so the fork cannot be rendered.`);

		const observationId = await copyObservation(tx, source.observationId, targetTeam.id, input.userId);
		if (!observationId.ok) return observationId;
		const observation = observationId.value ? ((await getObservation(tx, observationId.value))?.summary ?? null) : null;
		const params = sourceVersion.params;
		// Checked again under the target team's rule policy: its errors block the fork's first version.
		const findings = validate(params, observation, await getRulePolicy(tx, targetTeam.id));
		if (hasErrors(findings)) {
			const errors = findings.filter((f) => f.severity === 'error');
			return fail(
				'validation_failed',
				`Under ${targetTeam.name}'s rules this version has ${errors.length} error finding${errors.length === 1 ? '' : 's'}, so it cannot be saved as the fork's first version. Ask a lead of ${targetTeam.name} about the team's rule policy, or fork a different version.`,
				errors.map((f) => ({ path: f.path, message: `${f.code}: ${f.message}` }))
			);
		}

		const fork = await insertRecipe(tx, { teamId: targetTeam.id, title: source.title, observationId: observationId.value, draft: params, userId: input.userId });
		const link: ForkLink = { recipeId: source.id, version: sourceVersion.version };
		await setRecipeForkedFrom(tx, fork.id, link);
		const rendered = renderWithTemplate({ template, recipe: params, observation, recipeId: fork.id, recipeVersion: 1 });
		if (!rendered.ok) return rendered;
		const sourceTeam = await getTeam(tx, source.teamId);
		const sourceTeamName = sourceTeam?.name ?? 'another team';
		await insertRecipeVersion(tx, {
			recipeId: fork.id,
			version: 1,
			params,
			paramsSha256: paramsSha256(params),
			templateVersionId: template.id,
			program: rendered.value.program,
			programSha256: rendered.value.sha256,
			findings,
			message: `Forked from "${source.title}" version ${sourceVersion.version} (${sourceTeamName})`,
			authorId: input.userId
		});
		const details = { sourceRecipeId: source.id, sourceVersion: sourceVersion.version, forkRecipeId: fork.id, targetTeamId: targetTeam.id, templateVersionId: template.id };
		await recordAudit(tx, { teamId: targetTeam.id, actorId: input.userId, action: 'recipe.fork', subjectType: 'recipe', subjectId: fork.id, details, now });
		if (source.teamId !== targetTeam.id) {
			await recordAudit(tx, { teamId: source.teamId, actorId: input.userId, action: 'recipe.forked_by_other_team', subjectType: 'recipe', subjectId: source.id, details, now });
		}
		const leads = (await listMembers(tx, source.teamId)).filter((m) => m.role === 'lead').map((m) => m.userId);
		const notified = await queueNotifications(tx, {
			kind: 'recipe_forked',
			recipientIds: leads,
			excludeIds: [input.userId],
			// The source team's own version page: the fork itself may not be visible to them.
			linkPath: `/recipes/${source.id}/versions/${sourceVersion.version}`,
			payload: { recipeTitle: source.title, version: sourceVersion.version, teamName: sourceTeamName, actorName: displayNameOf(acting.user), forkTeamName: targetTeam.name },
			now
		});
		return { ok: true, value: { recipeId: fork.id, version: 1, templateVersionId: template.id, observationId: observationId.value, notified } };
	});
}

const MAX_LINEAGE_DEPTH = 100;

export type LineageView = {
	chain: (LineageEntry & { title: string; teamId: string; teamName: string })[];
	/** False when an upstream recipe was deleted or is not visible to the viewer. */
	complete: boolean;
};

function canSee(actor: Actor | null, row: RecipeLineageRow): boolean {
	return actor === null || can(actor, 'recipe.view', { teamId: row.teamId, shared: row.shared });
}

/** The recipe's fork lineage up to its root; with `viewerId`, upstream recipes the viewer cannot see end the chain. */
export async function getLineage(db: Executor, recipeId: string, opts: { viewerId?: string } = {}): Promise<DomainResult<LineageView>> {
	const actor = opts.viewerId ? ((await loadActor(db, opts.viewerId))?.actor ?? null) : null;
	if (opts.viewerId && !actor) return fail('unauthenticated', 'Sign in to see the lineage.');
	const rows = new Map<string, RecipeLineageRow>();
	let next: string | null = recipeId;
	for (let depth = 0; next !== null && depth < MAX_LINEAGE_DEPTH && !rows.has(next); depth++) {
		const row: RecipeLineageRow | null = await getRecipeLineageRow(db, next);
		if (!row || (depth > 0 && !canSee(actor, row))) break;
		rows.set(row.recipeId, row);
		next = row.forkedFrom?.recipeId ?? null;
	}
	if (!rows.has(recipeId)) return fail('not_found', 'No such recipe.');
	const traced = traceLineage(recipeId, new Map([...rows].map(([id, r]) => [id, r.forkedFrom])));
	if (!traced.ok) return traced;
	const chain = traced.value.chain.map((e) => {
		const r = rows.get(e.recipeId);
		return { ...e, title: r?.title ?? '', teamId: r?.teamId ?? '', teamName: r?.teamName ?? '' };
	});
	return { ok: true, value: { chain, complete: traced.value.complete } };
}

/** What "compare with upstream" diffs against: the upstream's newest approved version, else the forked version; null for a recipe that is not a fork. */
export async function getCompareTarget(db: Executor, recipeId: string, opts: { viewerId?: string } = {}): Promise<DomainResult<CompareTarget | null>> {
	const row = await getRecipeLineageRow(db, recipeId);
	if (!row) return fail('not_found', 'No such recipe.');
	if (!row.forkedFrom) return { ok: true, value: null };
	const upstream = await getRecipeLineageRow(db, row.forkedFrom.recipeId);
	if (!upstream) return { ok: true, value: null };
	if (opts.viewerId) {
		const actor = (await loadActor(db, opts.viewerId))?.actor ?? null;
		if (!actor || !canSee(actor, upstream)) return fail('forbidden', `The upstream recipe "${upstream.title}" is no longer shared with your teams, so it cannot be compared.`);
	}
	const states = await listVersionStates(db, upstream.recipeId);
	return { ok: true, value: findCompareTarget(row.forkedFrom, states) };
}
