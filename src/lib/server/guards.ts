import { error, redirect, type RequestEvent } from '@sveltejs/kit';
import { can, type Action, type Actor, type Subject } from '$lib/workflow/permissions';
import type { SessionUser } from './db/queries/users';

/** What the guards read from a request: only the session user. */
export type GuardEvent = { locals: Pick<App.Locals, 'user'> };

// Auth.js names its database-session cookie differently on http and https.
export const SESSION_COOKIES = ['authjs.session-token', '__Secure-authjs.session-token'] as const;

/** The permission-relevant view of a signed-in user. */
export function actorOf(user: SessionUser | null): Actor | null {
	if (!user) return null;
	return { userId: user.id, isAdmin: user.isAdmin, memberships: user.memberships.map((m) => ({ teamId: m.teamId, role: m.role })) };
}

/** The signed-in user; 401 otherwise (API routes and actions). */
export function requireUser(event: GuardEvent): SessionUser {
	const user = event.locals.user;
	if (!user) error(401, { message: 'Sign in to continue.', code: 'unauthenticated' });
	return user;
}

/** The signed-in user; pages redirect to sign-in (and come back) otherwise. */
export function requirePageUser(event: GuardEvent & Pick<RequestEvent, 'url'>): SessionUser {
	const user = event.locals.user;
	if (!user) redirect(303, `/signin?redirectTo=${encodeURIComponent(event.url.pathname + event.url.search)}`);
	return user;
}

/**
 * The signed-in user allowed to do `action` on `subject`: 401 when signed out, 404 when
 * the subject belongs to a team the user cannot see at all (its existence is not
 * revealed), 403 when visible but the role is not enough.
 */
export function requireCan(event: GuardEvent, action: Action, subject: Subject, visibleWith?: Action): SessionUser {
	const user = requireUser(event);
	const actor = actorOf(user);
	if (can(actor, action, subject)) return user;
	if (visibleWith && !can(actor, visibleWith, subject)) {
		error(404, { message: 'Not found, or not visible to your teams.', code: 'not_found' });
	}
	error(403, { message: `Your role does not allow this (${action.replace('.', ': ').replace('_', ' ')}).`, code: 'forbidden' });
}

/** Only the site admin. */
export function requireAdmin(event: GuardEvent): SessionUser {
	return requireCan(event, 'admin.manage', { teamId: null });
}
