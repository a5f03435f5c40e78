import type { Executor } from '../db/client';
import {
	getReviewSubject,
	insertReviewComment,
	insertReviewEvent,
	listCommenterIds,
	listReviewComments,
	listReviewEvents,
	listVersionsInReview,
	setReviewState,
	type ReviewCommentRow,
	type ReviewEventRow,
	type ReviewQueueItem,
	type ReviewSubject
} from '../db/queries/reviews';
import { listMembers } from '../db/queries/teams';
import { MAX_COMMENT_CHARS } from '../db/schema';
import { hasErrors } from '$lib/calibration/validate';
import { can } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { listAllowedActions, transition, type ReviewAction, type ReviewState } from '$lib/workflow/review-state';
import { displayNameOf, loadActor, recordAudit } from './audit';
import { inResultTransaction } from '../db/transaction';
import { queueNotifications } from './notifications';

export type ReviewDecision = 'approve' | 'request_changes';
export type ReviewOutcome = { versionId: string; from: ReviewState; to: ReviewState; notified: number };

/** Path of a version's review page (the link in e-mails). */
export function reviewPagePath(recipeId: string, version: number): string {
	return `/recipes/${recipeId}/versions/${version}/reviews`;
}

function countChars(s: string): number {
	return [...s].length;
}

function checkNote(note: string | undefined): DomainResult<string | null> {
	if (note === undefined || note.trim() === '') return { ok: true, value: null };
	if (countChars(note) > MAX_COMMENT_CHARS) return fail('validation_failed', `The note is ${countChars(note)} characters long; the limit is ${MAX_COMMENT_CHARS}.`, [{ path: 'note', message: `at most ${MAX_COMMENT_CHARS} characters` }]);
	return { ok: true, value: note };
}

// One review action: lock the version's state, apply the state machine, then write the
// state, its event, its audit entry and its notifications in the same transaction.
async function applyReviewAction(
	db: Executor,
	input: { versionId: string; userId: string; action: ReviewAction; note?: string; now?: Date }
): Promise<DomainResult<ReviewOutcome>> {
	const note = checkNote(input.note);
	if (!note.ok) return note;
	const now = input.now ?? new Date();
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to take part in reviews.');
		const subject = await getReviewSubject(tx, input.versionId, true);
		if (!subject) return fail('not_found', 'No such recipe version.');
		const moved = transition({
			state: subject.state,
			action: input.action,
			actor: acting.actor,
			// A version whose author account is gone has no author who could approve it.
			version: { authorId: subject.authorId ?? '', hasErrors: hasErrors(subject.findings) },
			teamId: subject.teamId
		});
		if (!moved.ok) return moved;
		const { to, event } = moved.value;
		await setReviewState(tx, subject.versionId, to, now);
		await insertReviewEvent(tx, { versionId: subject.versionId, action: event.action, from: event.from, to, actorId: event.by, note: note.value, now });
		await recordAudit(tx, {
			teamId: subject.teamId,
			actorId: input.userId,
			action: `review.${input.action}`,
			subjectType: 'recipe_version',
			subjectId: subject.versionId,
			details: { recipeId: subject.recipeId, version: subject.version, from: event.from, to },
			now
		});
		const notified = await notifyReviewAction(tx, subject, input.action, { userId: input.userId, name: displayNameOf(acting.user), note: note.value, now });
		return { ok: true, value: { versionId: subject.versionId, from: event.from, to, notified } };
	});
}

async function notifyReviewAction(tx: Executor, s: ReviewSubject, action: ReviewAction, by: { userId: string; name: string; note: string | null; now: Date }): Promise<number> {
	const base = { linkPath: reviewPagePath(s.recipeId, s.version), now: by.now, excludeIds: [by.userId] };
	const payload = { recipeTitle: s.recipeTitle, version: s.version, teamName: s.teamName, actorName: by.name };
	if (action === 'submit') {
		const deciders = (await listMembers(tx, s.teamId)).filter((m) => m.role === 'reviewer' || m.role === 'lead').map((m) => m.userId);
		return queueNotifications(tx, { ...base, kind: 'review_requested', recipientIds: deciders, excludeIds: [by.userId, s.authorId], payload });
	}
	if (action === 'approve' || action === 'request_changes') {
		const decision = action === 'approve' ? 'approved' : 'changes_requested';
		return queueNotifications(tx, { ...base, kind: 'review_decided', recipientIds: [s.authorId], payload: { ...payload, decision, ...(by.note ? { note: by.note } : {}) } });
	}
	return 0;
}

/** Submits a saved version for review (author's team members); the team's reviewers and leads are notified. */
export function submitForReview(db: Executor, input: { versionId: string; userId: string; now?: Date }): Promise<DomainResult<ReviewOutcome>> {
	return applyReviewAction(db, { ...input, action: 'submit' });
}

/** Takes a version out of review again (its author only). */
export function withdrawFromReview(db: Executor, input: { versionId: string; userId: string; now?: Date }): Promise<DomainResult<ReviewOutcome>> {
	return applyReviewAction(db, { ...input, action: 'withdraw' });
}

/** A reviewer's or lead's decision on a version in review, with an optional note to the author. */
export function decideReview(db: Executor, input: { versionId: string; userId: string; decision: ReviewDecision; note?: string; now?: Date }): Promise<DomainResult<ReviewOutcome>> {
	return applyReviewAction(db, { versionId: input.versionId, userId: input.userId, action: input.decision, ...(input.note !== undefined ? { note: input.note } : {}), ...(input.now ? { now: input.now } : {}) });
}

/** Number of lines of a rendered program (a final newline does not start a line). */
export function countProgramLines(program: string): number {
	if (program === '') return 0;
	const n = program.split('\n').length;
	return program.endsWith('\n') ? n - 1 : n;
}

/** A comment on a whole version, or on one line of its program; the author and earlier commenters are notified. */
export async function addComment(
	db: Executor,
	input: { versionId: string; userId: string; body: string; programLine?: number | null; now?: Date }
): Promise<DomainResult<{ id: string; notified: number }>> {
	const body = input.body;
	if (body.trim() === '') return fail('validation_failed', 'The comment is empty: write what the author should look at.', [{ path: 'body', message: 'required' }]);
	if (countChars(body) > MAX_COMMENT_CHARS) {
		return fail('validation_failed', `The comment is ${countChars(body)} characters long; the limit is ${MAX_COMMENT_CHARS}. Split it into several comments.`, [{ path: 'body', message: `at most ${MAX_COMMENT_CHARS} characters` }]);
	}
	const line = input.programLine ?? null;
	const now = input.now ?? new Date();
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to comment.');
		const subject = await getReviewSubject(tx, input.versionId);
		if (!subject) return fail('not_found', 'No such recipe version.');
		if (!can(acting.actor, 'review.comment', { teamId: subject.teamId })) return fail('forbidden', "Only members of the recipe's team can comment on its versions.");
		const lines = countProgramLines(subject.program);
		if (line !== null && (!Number.isInteger(line) || line < 1 || line > lines)) {
			return fail('validation_failed', `Line ${line} is not in the program of version ${subject.version}: choose a line from 1 to ${lines}, or comment on the whole version.`, [{ path: 'programLine', message: `1 to ${lines}` }]);
		}
		const earlier = await listCommenterIds(tx, subject.versionId);
		const row = await insertReviewComment(tx, { versionId: subject.versionId, authorId: input.userId, body, programLine: line, now });
		await recordAudit(tx, {
			teamId: subject.teamId,
			actorId: input.userId,
			action: 'review.comment',
			subjectType: 'recipe_version',
			subjectId: subject.versionId,
			details: { recipeId: subject.recipeId, version: subject.version, commentId: row.id, programLine: line },
			now
		});
		const excerpt = [...body].slice(0, 500).join('') + (countChars(body) > 500 ? ' …' : '');
		const notified = await queueNotifications(tx, {
			kind: 'comment_added',
			recipientIds: [subject.authorId, ...earlier],
			excludeIds: [input.userId],
			linkPath: reviewPagePath(subject.recipeId, subject.version),
			payload: { recipeTitle: subject.recipeTitle, version: subject.version, teamName: subject.teamName, actorName: displayNameOf(acting.user), commentExcerpt: excerpt, programLine: line },
			now
		});
		return { ok: true, value: { id: row.id, notified } };
	});
}

/** Versions waiting for a decision in the given teams (the review queue). */
export function listReviewQueue(db: Executor, teamIds: readonly string[]): Promise<ReviewQueueItem[]> {
	return listVersionsInReview(db, teamIds);
}

export type TimelineEntry = ({ type: 'event' } & ReviewEventRow) | ({ type: 'comment' } & ReviewCommentRow);
export type ReviewTimeline = { state: ReviewState; events: ReviewEventRow[]; comments: ReviewCommentRow[]; entries: TimelineEntry[] };

/** A version's review state, every state change and every comment, in time order. */
export async function getReviewTimeline(db: Executor, versionId: string): Promise<DomainResult<ReviewTimeline>> {
	const subject = await getReviewSubject(db, versionId);
	if (!subject) return fail('not_found', 'No such recipe version.');
	const events = await listReviewEvents(db, versionId);
	const comments = await listReviewComments(db, versionId);
	const entries: TimelineEntry[] = [...events.map((e) => ({ type: 'event' as const, ...e })), ...comments.map((c) => ({ type: 'comment' as const, ...c }))];
	entries.sort((a, b) => a.at.getTime() - b.at.getTime());
	return { ok: true, value: { state: subject.state, events, comments, entries } };
}

/** The review actions a user may take on a version now (for showing buttons). */
export async function listReviewActionsFor(db: Executor, input: { versionId: string; userId: string }): Promise<ReviewAction[]> {
	const acting = await loadActor(db, input.userId);
	const subject = await getReviewSubject(db, input.versionId);
	if (!acting || !subject) return [];
	return listAllowedActions({ state: subject.state, actor: acting.actor, version: { authorId: subject.authorId ?? '', hasErrors: hasErrors(subject.findings) }, teamId: subject.teamId });
}
