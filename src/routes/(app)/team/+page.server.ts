import { redirect } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { requirePageUser } from '$lib/server/guards';

// "Team" in the navigation: the only team directly, or a choice when there are several.
export const load: PageServerLoad = (event) => {
	const user = requirePageUser(event);
	const first = user.memberships[0];
	if (user.memberships.length === 1 && first) redirect(303, `/teams/${first.teamId}`);
	return {};
};
