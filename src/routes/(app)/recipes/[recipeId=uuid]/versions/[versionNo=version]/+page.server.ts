import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { z } from 'zod';
import { addComment, decideReview, getReviewTimeline, listReviewActionsFor, submitForReview, withdrawFromReview } from '$lib/server/services/reviews';
import type { ReviewAction, ReviewState } from '$lib/workflow/review-state';
import { getDb } from '$lib/server/db/client';
import { getRecipeVersion } from '$lib/server/db/queries/recipes';
import { getTemplateVersionById } from '$lib/server/db/queries/templates';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { summariseParams, type ParamSummaryRow } from '$lib/workflow/diff/param-summary';
import { programFilename } from '$lib/script/filename';
import type { Finding } from '$lib/calibration/validate';
import type { StepKind } from '$lib/calibration/recipe';
import { readFormFields, statusFor } from '$lib/server/http';
import type { DomainError } from '$lib/workflow/errors';

export type VersionPageData = {
	recipe: { id: string; title: string };
	version: { number: number; message: string; author: string | null; createdAt: string; programSha256: string; paramsSha256: string; template: string };
	summary: ParamSummaryRow[];
	findings: Finding[];
	steps: { kind: StepKind }[];
	program: string;
	filename: string;
	review: {
		state: ReviewState;
		actions: ReviewAction[];
		canComment: boolean;
		timeline: ({ type: 'event'; id: string; at: string; who: string; action: string; from: string; to: string; note: string | null } | { type: 'comment'; id: string; at: string; who: string; body: string; line: number | null; lineText: string | null })[];
	};
};

export const load: PageServerLoad = async (event): Promise<VersionPageData> => {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.view');
	const v = await getRecipeVersion(getDb(), recipe.id, Number(event.params.versionNo));
	if (!v) error(404, { message: `This recipe has no version ${event.params.versionNo}.`, code: 'not_found' });
	const timeline = await getReviewTimeline(getDb(), v.id);
	if (!timeline.ok) error(404, { message: timeline.error.message, code: 'not_found' });
	const lines = v.program.split('\n');
	const who = (name: string | null, email: string | null) => name ?? email ?? 'someone';
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
		filename: programFilename(v.params.title, v.version),
		review: {
			state: timeline.value.state,
			actions: await listReviewActionsFor(getDb(), { versionId: v.id, userId: user.id }),
			canComment: user.memberships.some((m) => m.teamId === recipe.teamId),
			timeline: timeline.value.entries.map((e) =>
				e.type === 'event'
					? { type: 'event' as const, id: e.id, at: e.at.toISOString(), who: who(e.actorName, e.actorEmail), action: e.action, from: e.from, to: e.to, note: e.note }
					: { type: 'comment' as const, id: e.id, at: e.at.toISOString(), who: who(e.authorName, e.authorEmail), body: e.body, line: e.programLine, lineText: e.programLine ? (lines[e.programLine - 1] ?? null) : null }
			)
		}
	};
};

const noteSchema = z.object({ note: z.string().trim().max(2000, 'Keep the note under 2000 characters.').default('') });
const commentSchema = z.object({
	body: z.string().trim().min(1, 'Write the comment first.').max(5000, 'Keep a comment under 5000 characters.'),
	line: z
		.string()
		.trim()
		.default('')
		.refine((v) => v === '' || /^[1-9][0-9]{0,6}$/.test(v), 'The line must be a positive whole number, or empty for the whole version.')
});

type ActionEvent = Parameters<Actions[string]>[0];

/** The version an action applies to, for the signed-in user (view access is checked). */
async function versionFor(event: ActionEvent) {
	const { recipe, user } = await loadRecipeFor(event, event.params.recipeId ?? '', 'recipe.view');
	const v = await getRecipeVersion(getDb(), recipe.id, Number(event.params.versionNo));
	if (!v) error(404, { message: 'No such version.', code: 'not_found' });
	return { v, user };
}

function outcome(r: { ok: true } | { ok: false; error: DomainError }, done: string) {
	if (r.ok) return { done };
	return fail(statusFor(r.error.code), { problem: r.error.message });
}

export const actions: Actions = {
	submit: async (event) => {
		const { v, user } = await versionFor(event);
		return outcome(await submitForReview(getDb(), { versionId: v.id, userId: user.id }), 'Submitted for review: the team\'s reviewers have been told.');
	},
	withdraw: async (event) => {
		const { v, user } = await versionFor(event);
		return outcome(await withdrawFromReview(getDb(), { versionId: v.id, userId: user.id }), 'Withdrawn from review.');
	},
	approve: async (event) => {
		const { v, user } = await versionFor(event);
		const parsed = noteSchema.safeParse(await readFormFields(event.request));
		if (!parsed.success) return fail(400, { problem: parsed.error.issues.map((i) => i.message).join(' ') });
		return outcome(await decideReview(getDb(), { versionId: v.id, userId: user.id, decision: 'approve', ...(parsed.data.note ? { note: parsed.data.note } : {}) }), 'Approved.');
	},
	requestChanges: async (event) => {
		const { v, user } = await versionFor(event);
		const parsed = noteSchema.safeParse(await readFormFields(event.request));
		if (!parsed.success) return fail(400, { problem: parsed.error.issues.map((i) => i.message).join(' ') });
		return outcome(await decideReview(getDb(), { versionId: v.id, userId: user.id, decision: 'request_changes', ...(parsed.data.note ? { note: parsed.data.note } : {}) }), 'Changes requested: the author has been told.');
	},
	comment: async (event) => {
		const { v, user } = await versionFor(event);
		const parsed = commentSchema.safeParse(await readFormFields(event.request));
		if (!parsed.success) return fail(400, { problem: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await addComment(getDb(), { versionId: v.id, userId: user.id, body: parsed.data.body, ...(parsed.data.line ? { programLine: Number(parsed.data.line) } : {}) });
		return outcome(r, 'Comment added.');
	}
};
