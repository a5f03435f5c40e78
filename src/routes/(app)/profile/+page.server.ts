import { fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { requirePageUser, requireUser } from '$lib/server/guards';
import { statusFor } from '$lib/server/http';
import { getNotificationSettings, NOTIFICATION_KINDS, setNotificationSetting, type NotificationSettings } from '$lib/server/services/notifications';

export type ProfilePageData = { notifications: NotificationSettings };

export const load: PageServerLoad = async (event): Promise<ProfilePageData> => {
	const user = requirePageUser(event);
	return { notifications: await getNotificationSettings(getDb(), user.id) };
};

export const actions: Actions = {
	saveNotifications: async (event) => {
		const user = requireUser(event);
		const form = await event.request.formData();
		// A ticked checkbox posts "on"; an unticked one posts nothing, which means off.
		const wanted: [string, boolean][] = [];
		for (const kind of NOTIFICATION_KINDS) {
			const value = form.get(kind);
			if (value !== null && value !== 'on') return fail(400, { message: `The setting "${kind}" was sent as ${JSON.stringify(String(value).slice(0, 40))}; tick or clear its checkbox and save again. Nothing was changed.` });
			wanted.push([kind, value === 'on']);
		}
		for (const [kind, enabled] of wanted) {
			const r = await setNotificationSetting(getDb(), { userId: user.id, kind, enabled });
			if (!r.ok) return fail(statusFor(r.error.code), { message: r.error.message });
		}
		const off = wanted.filter(([, on]) => !on).length;
		return { done: off === 0 ? 'Saved: you get every kind of e-mail.' : `Saved: ${off} kind${off === 1 ? '' : 's'} of e-mail turned off.` };
	}
};
