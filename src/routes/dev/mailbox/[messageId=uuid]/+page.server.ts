import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getMailMessage } from '$lib/server/db/queries/mail';

export type MailView = { to: string; from: string; subject: string; text: string; links: string[]; receivedAt: string };

export const load: PageServerLoad = async ({ params }): Promise<{ message: MailView }> => {
	const m = await getMailMessage(getDb(), params.messageId);
	if (!m) error(404, { message: 'No such message in the mailbox.', code: 'not_found' });
	const links = [...m.textBody.matchAll(/https?:\/\/\S+/g)].map((x) => x[0]);
	return { message: { to: m.envelopeTo.join(', '), from: m.envelopeFrom, subject: m.subject, text: m.textBody, links, receivedAt: m.receivedAt.toISOString() } };
};
