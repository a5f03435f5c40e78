import { json } from '@sveltejs/kit';
import type { RequestHandler } from './$types';
import { apiError, apiHandler, readJson } from '$lib/server/http';
import { requireCan } from '$lib/server/guards';
import { getDb } from '$lib/server/db/client';
import { listMembers } from '$lib/server/db/queries/teams';
import { addMember } from '$lib/server/services/teams';
import { addMemberInputSchema } from '$lib/workflow/team-schemas';
import type { MemberItem, MembersResponse } from './contract';

export const GET: RequestHandler = apiHandler(async (event) => {
	requireCan(event, 'team.view', { teamId: event.params.teamId }, 'team.view');
	const items = (await listMembers(getDb(), event.params.teamId)).map((m) => ({ userId: m.userId, email: m.email, name: m.name, role: m.role }));
	const body: MembersResponse = { items, nextCursor: null };
	return json(body);
});

export const POST: RequestHandler = apiHandler(async (event) => {
	requireCan(event, 'team.manage_members', { teamId: event.params.teamId }, 'team.view');
	const input = await readJson(event.request, addMemberInputSchema);
	const r = await addMember(getDb(), event.params.teamId, input);
	if (!r.ok) return apiError(r.error);
	const body: MemberItem = { userId: r.value.userId, email: r.value.email, name: r.value.name, role: r.value.role };
	return json(body, { status: 201 });
});
