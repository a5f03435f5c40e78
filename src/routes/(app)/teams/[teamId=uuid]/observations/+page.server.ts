import { error, fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getTeam } from '$lib/server/db/queries/teams';
import { actorOf, requireCan } from '$lib/server/guards';
import { listObservationItems, uploadObservation, type ObservationListItem } from '$lib/server/services/observations';
import { can } from '$lib/workflow/permissions';
import { statusFor } from '$lib/server/http';

export type ObservationsPageData = {
	team: { id: string; name: string };
	observations: ObservationListItem[];
	canUpload: boolean;
};

export const load: PageServerLoad = async (event): Promise<ObservationsPageData> => {
	const subject = { teamId: event.params.teamId };
	const user = requireCan(event, 'observation.view', subject, 'team.view');
	const team = await getTeam(getDb(), event.params.teamId);
	if (!team) error(404, { message: 'This team does not exist.', code: 'not_found' });
	return {
		team: { id: team.id, name: team.name },
		observations: await listObservationItems(getDb(), team.id),
		canUpload: can(actorOf(user), 'observation.upload', subject)
	};
};

export const actions: Actions = {
	upload: async (event) => {
		const user = requireCan(event, 'observation.upload', { teamId: event.params.teamId }, 'team.view');
		const file = (await event.request.formData()).get('summary');
		if (!(file instanceof File) || file.size === 0) return fail(400, { message: 'Choose an observation summary file (.json) to upload.', issues: [] });
		const r = await uploadObservation(getDb(), {
			teamId: event.params.teamId,
			bytes: new Uint8Array(await file.arrayBuffer()),
			filename: file.name,
			userId: user.id
		});
		if (!r.ok) return fail(statusFor(r.error.code), { message: r.error.message, issues: r.error.issues ?? [] });
		redirect(303, `/observations/${r.value.id}`);
	}
};
