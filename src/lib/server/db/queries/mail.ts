import { desc, eq } from 'drizzle-orm';
import type { Executor } from '../client';
import { mailMessages } from '../schema';

export type MailMessage = {
	id: string;
	envelopeFrom: string;
	envelopeTo: string[];
	subject: string;
	textBody: string;
	htmlBody: string | null;
	receivedAt: Date;
};

export type NewMailMessage = Omit<MailMessage, 'id' | 'receivedAt'> & { sizeBytes: number };

/** Stores one message received by the fake SMTP server. */
export async function insertMailMessage(db: Executor, m: NewMailMessage): Promise<string> {
	const [row] = await db.insert(mailMessages).values(m).returning({ id: mailMessages.id });
	if (!row) throw new Error('insert into mail_messages returned no row');
	return row.id;
}

/** Newest first. */
export async function listMailMessages(db: Executor, limit = 100): Promise<MailMessage[]> {
	return db
		.select({
			id: mailMessages.id,
			envelopeFrom: mailMessages.envelopeFrom,
			envelopeTo: mailMessages.envelopeTo,
			subject: mailMessages.subject,
			textBody: mailMessages.textBody,
			htmlBody: mailMessages.htmlBody,
			receivedAt: mailMessages.receivedAt
		})
		.from(mailMessages)
		.orderBy(desc(mailMessages.receivedAt))
		.limit(limit);
}

export async function getMailMessage(db: Executor, id: string): Promise<MailMessage | null> {
	const rows = await db.select().from(mailMessages).where(eq(mailMessages.id, id)).limit(1);
	const r = rows[0];
	return r
		? { id: r.id, envelopeFrom: r.envelopeFrom, envelopeTo: r.envelopeTo, subject: r.subject, textBody: r.textBody, htmlBody: r.htmlBody, receivedAt: r.receivedAt }
		: null;
}
