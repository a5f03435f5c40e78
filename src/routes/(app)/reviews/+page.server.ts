import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { actorOf, requirePageUser } from '$lib/server/guards';
import { listReviewQueue } from '$lib/server/services/reviews';
import { can } from '$lib/workflow/permissions';

export type ReviewQueuePage = { items: { recipeId: string; title: string; team: string; version: number; author: string | null; submittedAt: string }[]; decides: boolean };

// The review queue: versions of the teams the person reviews for, longest-waiting first.
export const load: PageServerLoad = async (event): Promise<ReviewQueuePage> => {
	const user = requirePageUser(event);
	const actor = actorOf(user);
	const teamIds = user.memberships.filter((m) => can(actor, 'review.decide', { teamId: m.teamId })).map((m) => m.teamId);
	const items = await listReviewQueue(getDb(), teamIds);
	return {
		items: items.map((i) => ({ recipeId: i.recipeId, title: i.recipeTitle, team: i.teamName, version: i.version, author: i.authorEmail, submittedAt: i.submittedAt.toISOString() })),
		decides: teamIds.length > 0
	};
};
