import { SMTPServer } from 'smtp-server';
import { simpleParser, type AddressObject } from 'mailparser';
import type { NewMailMessage } from '../db/queries/mail';

export const MAX_FAKE_MESSAGE_BYTES = 2 * 1024 * 1024;

export type FakeSmtp = { port: number; close: () => Promise<void> };

function addresses(a: AddressObject | AddressObject[] | undefined): string[] {
	const list = Array.isArray(a) ? a : a ? [a] : [];
	return list.flatMap((o) => o.value.map((v) => v.address ?? '')).filter((s) => s !== '');
}

/**
 * A real SMTP server on loopback that hands every message to `store` (which writes it to
 * PostgreSQL). `refuseNext` lets tests make it reject messages, as a real server may.
 */
export async function startFakeSmtp(opts: {
	port: number;
	store: (m: NewMailMessage) => Promise<unknown>;
	refuse?: () => boolean;
}): Promise<FakeSmtp> {
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		size: MAX_FAKE_MESSAGE_BYTES,
		logger: false,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('end', () => {
				if (opts.refuse?.()) {
					const err = Object.assign(new Error('Mailbox temporarily unavailable (test refusal)'), { responseCode: 451 });
					callback(err);
					return;
				}
				const raw = Buffer.concat(chunks);
				simpleParser(raw)
					.then((parsed) =>
						opts.store({
							envelopeFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
							envelopeTo: session.envelope.rcptTo.map((r) => r.address).concat(addresses(parsed.to)).filter((v, i, all) => all.indexOf(v) === i),
							subject: parsed.subject ?? '(no subject)',
							textBody: parsed.text ?? '',
							htmlBody: typeof parsed.html === 'string' ? parsed.html : null,
							sizeBytes: raw.length
						})
					)
					.then(() => callback(), (e: unknown) => callback(e instanceof Error ? e : new Error(String(e))));
			});
		}
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(opts.port, '127.0.0.1', () => resolve());
	});
	server.on('error', (e) => console.error('[mail] fake SMTP error:', e.message));
	const address = server.server.address();
	const port = typeof address === 'object' && address ? address.port : opts.port;
	return { port, close: () => new Promise<void>((r) => server.close(() => r())) };
}
