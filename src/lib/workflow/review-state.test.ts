import { describe, expect, it } from 'vitest';
import type { Actor, TeamRole } from './permissions';
import { REVIEW_ACTIONS, REVIEW_STATES, listAllowedActions, reviewActionSchema, transition, type ReviewAction, type ReviewState } from './review-state';

// The review rules as the brief and DESIGN.md ("Review", "Roles and permissions") state them,
// written out by hand so that a change in transition() shows up here.
const TEAM = 'team-own';
const AUTHOR_ID = 'u-author';

type Who = 'anonymous' | 'admin' | 'outsider' | `${TeamRole}` | `${TeamRole}-author`;
const WHO: Who[] = ['anonymous', 'admin', 'outsider', 'member', 'reviewer', 'lead', 'member-author', 'reviewer-author', 'lead-author'];

function actorFor(who: Who): Actor | null {
	if (who === 'anonymous') return null;
	if (who === 'admin') return { userId: 'u-admin', isAdmin: true, memberships: [] };
	if (who === 'outsider') return { userId: 'u-outsider', isAdmin: false, memberships: [{ teamId: 'team-other', role: 'lead' }] };
	const [role, author] = who.split('-') as [TeamRole, string | undefined];
	return { userId: author ? AUTHOR_ID : `u-${role}`, isAdmin: false, memberships: [{ teamId: TEAM, role }] };
}

type Outcome = 'ok' | 'unauthenticated' | 'forbidden';
// Outcome of each action taken from the state it is valid in (submit from draft, the others from in_review).
const PERMITTED: Record<ReviewAction, Record<Who, Outcome>> = {
	submit: {
		anonymous: 'unauthenticated', admin: 'forbidden', outsider: 'forbidden',
		member: 'ok', reviewer: 'ok', lead: 'ok', 'member-author': 'ok', 'reviewer-author': 'ok', 'lead-author': 'ok'
	},
	approve: {
		anonymous: 'unauthenticated', admin: 'forbidden', outsider: 'forbidden',
		member: 'forbidden', reviewer: 'ok', lead: 'ok', 'member-author': 'forbidden', 'reviewer-author': 'forbidden', 'lead-author': 'forbidden'
	},
	request_changes: {
		anonymous: 'unauthenticated', admin: 'forbidden', outsider: 'forbidden',
		member: 'forbidden', reviewer: 'ok', lead: 'ok', 'member-author': 'forbidden', 'reviewer-author': 'ok', 'lead-author': 'ok'
	},
	withdraw: {
		anonymous: 'unauthenticated', admin: 'forbidden', outsider: 'forbidden',
		member: 'forbidden', reviewer: 'forbidden', lead: 'forbidden', 'member-author': 'ok', 'reviewer-author': 'ok', 'lead-author': 'ok'
	}
};
const VALID_FROM: Record<ReviewAction, ReviewState> = { submit: 'draft', approve: 'in_review', request_changes: 'in_review', withdraw: 'in_review' };
const TARGET: Record<ReviewAction, ReviewState> = { submit: 'in_review', approve: 'approved', request_changes: 'changes_requested', withdraw: 'draft' };

const cleanVersion = { authorId: AUTHOR_ID, hasErrors: false };

describe('transition: every role from the state each action is valid in', () => {
	for (const action of REVIEW_ACTIONS) {
		for (const who of WHO) {
			const expected = PERMITTED[action][who];
			it(`${expected === 'ok' ? 'lets' : 'refuses'} ${who} ${action} a version that is ${VALID_FROM[action]}`, () => {
				const actor = actorFor(who);
				const result = transition({ state: VALID_FROM[action], action, actor, version: cleanVersion, teamId: TEAM });
				if (expected === 'ok') {
					expect(result).toEqual({
						ok: true,
						value: { to: TARGET[action], event: { action, from: VALID_FROM[action], to: TARGET[action], by: actor?.userId } }
					});
				} else {
					expect(result.ok).toBe(false);
					if (!result.ok) expect(result.error.code).toBe(expected);
				}
			});
		}
	}
});

describe('transition: refused moves name the current state', () => {
	// A permitted actor for each action, so only the state can refuse the move.
	const permittedActor: Record<ReviewAction, Who> = { submit: 'member', approve: 'reviewer', request_changes: 'lead', withdraw: 'member-author' };
	for (const action of REVIEW_ACTIONS) {
		for (const state of REVIEW_STATES) {
			if (state === VALID_FROM[action]) continue;
			it(`refuses to ${action} a version that is ${state} as a conflict`, () => {
				const result = transition({ state, action, actor: actorFor(permittedActor[action]), version: cleanVersion, teamId: TEAM });
				expect(result.ok).toBe(false);
				if (result.ok) return;
				expect(result.error.code).toBe('conflict');
				const stateWords = { draft: 'draft', in_review: 'in review', approved: 'approved', changes_requested: 'changes requested' }[state];
				expect(result.error.message).toContain(stateWords);
			});
		}
	}
});

describe('transition: rules', () => {
	it("refuses approval by the version's author, with a message saying why", () => {
		const result = transition({ state: 'in_review', action: 'approve', actor: actorFor('lead-author'), version: cleanVersion, teamId: TEAM });
		expect(result.ok).toBe(false);
		if (result.ok) return;
		expect(result.error.code).toBe('forbidden');
		expect(result.error.message).toMatch(/cannot approve a version you saved yourself/);
	});

	it('refuses to approve a version with error findings', () => {
		const result = transition({
			state: 'in_review',
			action: 'approve',
			actor: actorFor('reviewer'),
			version: { authorId: AUTHOR_ID, hasErrors: true },
			teamId: TEAM
		});
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.error.message).toMatch(/error findings/);
	});

	it('still lets a reviewer request changes on a version with error findings', () => {
		const result = transition({
			state: 'in_review',
			action: 'request_changes',
			actor: actorFor('reviewer'),
			version: { authorId: AUTHOR_ID, hasErrors: true },
			teamId: TEAM
		});
		expect(result.ok && result.value.to).toBe('changes_requested');
	});

	it('points the author to a new version after changes were requested', () => {
		const result = transition({ state: 'changes_requested', action: 'submit', actor: actorFor('member-author'), version: cleanVersion, teamId: TEAM });
		expect(result.ok).toBe(false);
		if (!result.ok) expect(result.error.message).toMatch(/Save a new version/);
	});

	it('runs a whole cycle: changes requested on version 1, then version 2 submitted and approved', () => {
		const author = actorFor('member-author');
		const reviewer = actorFor('reviewer');
		const run = (moves: readonly (readonly [ReviewAction, Actor | null])[]): ReviewState[] => {
			// Every saved version starts in draft.
			let state: ReviewState = 'draft';
			const seen: ReviewState[] = [];
			for (const [action, actor] of moves) {
				const r = transition({ state, action, actor, version: cleanVersion, teamId: TEAM });
				if (!r.ok) throw new Error(r.error.message);
				state = r.value.to;
				seen.push(state);
			}
			return seen;
		};
		expect(run([['submit', author], ['request_changes', reviewer]])).toEqual(['in_review', 'changes_requested']);
		expect(run([['submit', author], ['withdraw', author], ['submit', author], ['approve', reviewer]])).toEqual(['in_review', 'draft', 'in_review', 'approved']);
	});
});

describe('listAllowedActions', () => {
	it('offers a reviewer who is not the author approve and request changes on a version in review', () => {
		expect(listAllowedActions({ state: 'in_review', actor: actorFor('reviewer'), version: cleanVersion, teamId: TEAM })).toEqual([
			'approve',
			'request_changes'
		]);
	});
	it('offers the author only withdraw while the version is in review', () => {
		expect(listAllowedActions({ state: 'in_review', actor: actorFor('member-author'), version: cleanVersion, teamId: TEAM })).toEqual(['withdraw']);
	});
	it('offers nothing on an approved version', () => {
		expect(listAllowedActions({ state: 'approved', actor: actorFor('lead'), version: cleanVersion, teamId: TEAM })).toEqual([]);
	});
});

describe('reviewActionSchema', () => {
	it('accepts the four actions and rejects anything else with a message listing them', () => {
		expect(REVIEW_ACTIONS.map((a) => reviewActionSchema.safeParse(a).success)).toEqual([true, true, true, true]);
		const bad = reviewActionSchema.safeParse('merge');
		expect(bad.success).toBe(false);
		if (!bad.success) expect(bad.error.issues[0]?.message).toBe('Choose a review action: submit, approve, request_changes or withdraw.');
	});
});
