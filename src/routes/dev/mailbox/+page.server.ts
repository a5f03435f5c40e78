import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { listMailMessages } from '$lib/server/db/queries/mail';

export type MailboxRow = { id: string; to: string; subject: string; receivedAt: string };

export const load: PageServerLoad = async (): Promise<{ messages: MailboxRow[] }> => {
	const rows = await listMailMessages(getDb(), 200);
	return { messages: rows.map((m) => ({ id: m.id, to: m.envelopeTo.join(', '), subject: m.subject, receivedAt: m.receivedAt.toISOString() })) };
};
