import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiHandler } from '$lib/server/http';
import { requireUser } from '$lib/server/guards';
import type { MeResponse } from './contract';

export const GET: RequestHandler = apiHandler(async (event) => {
	const user = requireUser(event);
	const body: MeResponse = {
		id: user.id,
		email: user.email,
		name: user.name,
		isAdmin: user.isAdmin,
		teams: user.memberships.map((m) => ({ id: m.teamId, name: m.teamName, role: m.role }))
	};
	return json(body);
});
