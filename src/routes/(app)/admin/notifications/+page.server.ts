import { fail } from '@sveltejs/kit';
import { z } from 'zod';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { requireAdmin } from '$lib/server/guards';
import { statusFor } from '$lib/server/http';
import { listFailedNotifications, retryFailedNotification, type NotificationKind } from '$lib/server/services/notifications';

export type FailedNotificationsPageData = {
	failed: { id: string; kind: NotificationKind; recipient: string; linkPath: string; attempts: number; lastError: string | null; createdAt: string; lastAttemptAt: string }[];
};

export const load: PageServerLoad = async (event): Promise<FailedNotificationsPageData> => {
	requireAdmin(event);
	const rows = await listFailedNotifications(getDb());
	return {
		failed: rows.map((r) => ({
			id: r.id,
			kind: r.kind,
			recipient: r.recipientEmail,
			linkPath: r.linkPath,
			attempts: r.attempts,
			lastError: r.lastError,
			createdAt: r.createdAt.toISOString(),
			lastAttemptAt: r.lastAttemptAt.toISOString()
		}))
	};
};

const retryInputSchema = z.object({ id: z.uuid({ message: 'The form does not name a message to queue again; reload the page and use its "Queue again" button.' }) });

export const actions: Actions = {
	retry: async (event) => {
		requireAdmin(event);
		const parsed = retryInputSchema.safeParse({ id: (await event.request.formData()).get('id') });
		if (!parsed.success) return fail(400, { message: parsed.error.issues.map((i) => i.message).join(' ') });
		const r = await retryFailedNotification(getDb(), { id: parsed.data.id });
		if (!r.ok) return fail(statusFor(r.error.code), { message: r.error.message });
		return { done: 'The message is queued again; the mail worker sends it within a few seconds.' };
	}
};
