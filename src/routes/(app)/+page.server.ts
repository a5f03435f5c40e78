import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { actorOf, requirePageUser } from '$lib/server/guards';
import { listRecipePage, type RecipeListPage } from '$lib/server/services/recipe-list';
import { listReviewQueue } from '$lib/server/services/reviews';
import { can } from '$lib/workflow/permissions';

export type DashboardData = { recent: RecipeListPage['items']; total: number; waitingForReview: number | null };

export const load: PageServerLoad = async (event): Promise<DashboardData> => {
	const user = requirePageUser(event);
	const actor = actorOf(user);
	const teamIds = user.memberships.map((m) => m.teamId);
	const page = await listRecipePage(getDb(), { teamIds, text: '', sort: 'updated', descending: true, offset: 0, limit: 5 });
	const reviewTeams = user.memberships.filter((m) => can(actor, 'review.decide', { teamId: m.teamId })).map((m) => m.teamId);
	return {
		recent: page.items,
		total: page.total,
		waitingForReview: reviewTeams.length > 0 ? (await listReviewQueue(getDb(), reviewTeams)).length : null
	};
};
