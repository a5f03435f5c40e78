import { describe, expect, it } from 'vitest';
import { ACTIONS, can, wouldRemoveLastLead, type Action, type Actor, type TeamRole } from './permissions';

// The permission matrix as DESIGN.md "Roles and permissions" states it, written out by
// hand (not derived from the code) so that a change in can() shows up here.
const OWN = 'team-own';
const OTHER = 'team-other';
type Who = 'anonymous' | TeamRole | 'admin';
type Where = 'own' | 'other' | 'shared';

const expected: Record<Action, Record<Where, Who[]>> = {
	'team.view': { own: ['member', 'reviewer', 'lead', 'admin'], other: ['admin'], shared: ['admin'] },
	'team.manage_members': { own: ['lead', 'admin'], other: ['admin'], shared: ['admin'] },
	'team.set_policy': { own: ['lead'], other: [], shared: [] },
	'recipe.view': { own: ['member', 'reviewer', 'lead'], other: [], shared: ['member', 'reviewer', 'lead'] },
	'recipe.create': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'recipe.edit': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'recipe.submit': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'recipe.share': { own: ['lead'], other: [], shared: [] },
	'recipe.fork': { own: ['member', 'reviewer', 'lead'], other: [], shared: ['member', 'reviewer', 'lead'] },
	'review.comment': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'review.decide': { own: ['reviewer', 'lead'], other: [], shared: [] },
	'observation.view': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'observation.upload': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'template.view': { own: ['member', 'reviewer', 'lead'], other: [], shared: [] },
	'template.manage': { own: ['lead'], other: [], shared: [] },
	'audit.view': { own: ['lead'], other: [], shared: [] },
	'admin.manage': { own: ['admin'], other: ['admin'], shared: ['admin'] }
};

function actorFor(who: Who, whereTeam: string): Actor | null {
	if (who === 'anonymous') return null;
	if (who === 'admin') return { userId: 'u-admin', isAdmin: true, memberships: [] };
	// A member of their own team; when acting on another team's resource they still
	// belong to a team of their own (so forking a shared recipe is possible).
	return { userId: `u-${who}`, isAdmin: false, memberships: [{ teamId: whereTeam, role: who }] };
}

const WHO: Who[] = ['anonymous', 'member', 'reviewer', 'lead', 'admin'];

describe('can(): role × action × own team / other team / shared / anonymous', () => {
	for (const action of ACTIONS) {
		for (const where of ['own', 'other', 'shared'] as const) {
			for (const who of WHO) {
				const allowed = expected[action][where].includes(who);
				it(`${allowed ? 'allows' : 'refuses'} ${who} to ${action} on ${where} resource`, () => {
					const actor = actorFor(who, OWN);
					const subject = { teamId: where === 'own' ? OWN : OTHER, shared: where === 'shared' };
					expect(can(actor, action, subject)).toBe(allowed);
				});
			}
		}
	}

	it('lets every signed-in person read starter templates but only admins change them', () => {
		expect(can(actorFor('member', OWN), 'template.view', { teamId: null })).toBe(true);
		expect(can(null, 'template.view', { teamId: null })).toBe(false);
		expect(can(actorFor('lead', OWN), 'template.manage', { teamId: null })).toBe(false);
		expect(can(actorFor('admin', OWN), 'template.manage', { teamId: null })).toBe(true);
	});

	it('refuses forking a shared recipe to someone without any team', () => {
		const loner: Actor = { userId: 'u', isAdmin: false, memberships: [] };
		expect(can(loner, 'recipe.fork', { teamId: OTHER, shared: true })).toBe(false);
	});
});

describe('wouldRemoveLastLead', () => {
	const team = [
		{ userId: 'a', role: 'lead' as const },
		{ userId: 'b', role: 'member' as const }
	];
	it('refuses demoting the only lead', () => {
		expect(wouldRemoveLastLead(team, 'a', 'reviewer')).toBe(true);
		expect(wouldRemoveLastLead(team, 'a', null)).toBe(true);
	});
	it('allows demoting a lead when another lead remains', () => {
		expect(wouldRemoveLastLead([...team, { userId: 'c', role: 'lead' }], 'a', 'member')).toBe(false);
	});
	it('allows changing a non-lead', () => {
		expect(wouldRemoveLastLead(team, 'b', null)).toBe(false);
	});
});
