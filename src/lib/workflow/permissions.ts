// Every permission rule of Phasewright, in one pure function. The server enforces it
// (src/lib/server/guards.ts) and the UI uses it to hide what a person cannot do.

export const TEAM_ROLES = ['member', 'reviewer', 'lead'] as const;
export type TeamRole = (typeof TEAM_ROLES)[number];

export type Actor = {
	userId: string;
	isAdmin: boolean;
	memberships: ReadonlyArray<{ teamId: string; role: TeamRole }>;
};

/** What an action is applied to: a team's resource (optionally shared) or the site. */
export type Subject = {
	teamId: string | null;
	shared?: boolean;
};

export const ACTIONS = [
	'team.view',
	'team.manage_members',
	'team.set_policy',
	'recipe.view',
	'recipe.create',
	'recipe.edit',
	'recipe.submit',
	'recipe.share',
	'recipe.fork',
	'review.comment',
	'review.decide',
	'observation.view',
	'observation.upload',
	'template.view',
	'template.manage',
	'audit.view',
	'admin.manage'
] as const;
export type Action = (typeof ACTIONS)[number];

const RANK: Record<TeamRole, number> = { member: 1, reviewer: 2, lead: 3 };

/** Minimum role in the subject's own team for each team-scoped action. */
const MIN_ROLE: Partial<Record<Action, TeamRole>> = {
	'team.view': 'member',
	'team.manage_members': 'lead',
	'team.set_policy': 'lead',
	'recipe.view': 'member',
	'recipe.create': 'member',
	'recipe.edit': 'member',
	'recipe.submit': 'member',
	'recipe.share': 'lead',
	'recipe.fork': 'member',
	'review.comment': 'member',
	'review.decide': 'reviewer',
	'observation.view': 'member',
	'observation.upload': 'member',
	'template.view': 'member',
	'template.manage': 'lead',
	'audit.view': 'lead'
};

/** The actor's role in a team, or null when not a member. */
export function roleIn(actor: Actor | null, teamId: string | null): TeamRole | null {
	if (!actor || teamId === null) return null;
	return actor.memberships.find((m) => m.teamId === teamId)?.role ?? null;
}

/** Whether `actor` may perform `action` on `subject`. Anonymous actors may do nothing. */
export function can(actor: Actor | null, action: Action, subject: Subject): boolean {
	if (!actor) return false;
	if (action === 'admin.manage') return actor.isAdmin;
	// Site admins manage teams (members and roles) but do not act inside a team's work.
	if (actor.isAdmin && (action === 'team.view' || action === 'team.manage_members')) return true;
	// Starter templates (no team) are readable by everyone signed in; only admins change them.
	if (subject.teamId === null) {
		if (action === 'template.view') return true;
		if (action === 'template.manage') return actor.isAdmin;
		return false;
	}
	const role = roleIn(actor, subject.teamId);
	if (role) {
		const min = MIN_ROLE[action];
		return min !== undefined && RANK[role] >= RANK[min];
	}
	// Another team's resource: a shared recipe is read-only and forkable by any team member.
	if (subject.shared && (action === 'recipe.view' || action === 'recipe.fork')) {
		return actor.memberships.length > 0;
	}
	return false;
}

/** Whether removing or demoting `userId` would leave the team without a lead. */
export function wouldRemoveLastLead(
	members: ReadonlyArray<{ userId: string; role: TeamRole }>,
	userId: string,
	newRole: TeamRole | null
): boolean {
	const target = members.find((m) => m.userId === userId);
	if (!target || target.role !== 'lead' || newRole === 'lead') return false;
	return members.filter((m) => m.role === 'lead').length <= 1;
}
