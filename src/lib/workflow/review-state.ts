import { z } from 'zod';
import { can, type Actor } from './permissions';
import { fail, type DomainResult } from './errors';

// The review life of one saved recipe version (DESIGN.md "Review"). A version is
// immutable, so a decision is final for it: after `changes_requested` the author saves a
// new version, which starts again in `draft` and is submitted in its turn.

export const REVIEW_STATES = ['draft', 'in_review', 'approved', 'changes_requested'] as const;
export type ReviewState = (typeof REVIEW_STATES)[number];

export const REVIEW_ACTIONS = ['submit', 'approve', 'request_changes', 'withdraw'] as const;
export type ReviewAction = (typeof REVIEW_ACTIONS)[number];

/** A review action from a form or API request. */
export const reviewActionSchema = z.enum(REVIEW_ACTIONS, { message: 'Choose a review action: submit, approve, request_changes or withdraw.' });

/** The state every newly saved version starts in. */
export const INITIAL_REVIEW_STATE: ReviewState = 'draft';

export type ReviewEvent = { action: ReviewAction; from: ReviewState; to: ReviewState; by: string };

export type TransitionInput = {
	state: ReviewState;
	action: ReviewAction;
	actor: Actor | null;
	/** The version the action applies to: who saved it and whether its findings include errors. */
	version: { authorId: string; hasErrors: boolean };
	/** The team that owns the recipe. */
	teamId: string;
};

const MOVES: Record<ReviewAction, { from: readonly ReviewState[]; to: ReviewState }> = {
	submit: { from: ['draft'], to: 'in_review' },
	approve: { from: ['in_review'], to: 'approved' },
	request_changes: { from: ['in_review'], to: 'changes_requested' },
	withdraw: { from: ['in_review'], to: 'draft' }
};

const STATE_WORDS: Record<ReviewState, string> = {
	draft: 'a draft (not submitted)',
	in_review: 'in review',
	approved: 'approved',
	changes_requested: 'marked "changes requested"'
};

const ACTION_WORDS: Record<ReviewAction, string> = {
	submit: 'submitted for review',
	approve: 'approved',
	request_changes: 'sent back with changes requested',
	withdraw: 'withdrawn from review'
};

function explainRefusedMove(action: ReviewAction, state: ReviewState): string {
	const base = `This version is ${STATE_WORDS[state]}, so it cannot be ${ACTION_WORDS[action]}.`;
	if (state === 'changes_requested') return `${base} Save a new version with the requested changes and submit that one.`;
	if (state === 'approved') return `${base} An approved version is final; save a new version to change the recipe.`;
	if (state === 'draft') return `${base} Submit it for review first.`;
	return `${base} It is waiting for a reviewer's decision.`;
}

/** Apply a review action to a version's state, enforcing roles, self-approval and error findings. */
export function transition(input: TransitionInput): DomainResult<{ to: ReviewState; event: ReviewEvent }> {
	const { state, action, actor, version, teamId } = input;
	if (!actor) return fail('unauthenticated', 'Sign in to take part in reviews.');
	const subject = { teamId };

	if (action === 'submit' || action === 'withdraw') {
		if (!can(actor, 'recipe.submit', subject)) {
			return fail('forbidden', `Only members of the recipe's team can ${action === 'submit' ? 'submit it for review' : 'withdraw it from review'}.`);
		}
		if (action === 'withdraw' && actor.userId !== version.authorId) {
			return fail('forbidden', 'Only the author of this version can withdraw it from review; a reviewer can request changes instead.');
		}
	} else {
		if (!can(actor, 'review.decide', subject)) {
			return fail('forbidden', "Only the team's reviewers and leads can approve a version or request changes.");
		}
		if (action === 'approve' && actor.userId === version.authorId) {
			return fail('forbidden', 'You cannot approve a version you saved yourself; ask another reviewer or lead of the team.');
		}
	}

	const move = MOVES[action];
	if (!move.from.includes(state)) return fail('conflict', explainRefusedMove(action, state));

	if (action === 'approve' && version.hasErrors) {
		return fail('conflict', 'This version has error findings and cannot be approved; request changes so the author fixes them in a new version.');
	}
	return { ok: true, value: { to: move.to, event: { action, from: state, to: move.to, by: actor.userId } } };
}

/** The review actions this actor may take now (for showing buttons; the server still calls `transition`). */
export function listAllowedActions(input: Omit<TransitionInput, 'action'>): ReviewAction[] {
	return REVIEW_ACTIONS.filter((action) => transition({ ...input, action }).ok);
}
