import { integer, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';

// Messages received by the local fake SMTP server (development and tests only).
export const mailMessages = pgTable('mail_messages', {
	id: uuid('id').primaryKey().defaultRandom(),
	envelopeFrom: text('envelope_from').notNull(),
	envelopeTo: text('envelope_to').array().notNull(),
	subject: text('subject').notNull(),
	textBody: text('text_body').notNull(),
	htmlBody: text('html_body'),
	sizeBytes: integer('size_bytes').notNull(),
	receivedAt: timestamp('received_at', { withTimezone: true }).notNull().defaultNow()
});
