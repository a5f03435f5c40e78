import { describe, expect, it } from 'vitest';
import { inRollback } from './db';
import { startFakeSmtp } from '../../src/lib/server/mail/fake-smtp';
import { sendMail } from '../../src/lib/server/mail/transport';
import { signInMessage } from '../../src/lib/server/mail/messages';
import { insertMailMessage, listMailMessages } from '../../src/lib/server/db/queries/mail';
import { getEnv } from '../../src/lib/server/env';

describe('mail through a real SMTP conversation with the local fake', () => {
	it('stores a sent message with its recipients, subject and both bodies', async () => {
		await inRollback(async (tx) => {
			const fake = await startFakeSmtp({ port: getEnv().MAIL_FAKE_PORT, store: (m) => insertMailMessage(tx, m) });
			try {
				const url = 'http://127.0.0.1:4183/auth/callback/nodemailer?token=abc&email=ada%40example.org';
				await sendMail(signInMessage('ada@example.org', url, '127.0.0.1:4183'));
				const [m] = await listMailMessages(tx);
				expect(m?.envelopeTo).toEqual(['ada@example.org']);
				expect(m?.subject).toBe('Sign in to Phasewright (127.0.0.1:4183)');
				// The plain-text part keeps the link byte for byte (no HTML escaping of & or =).
				expect(m?.textBody).toContain(url);
				expect(m?.htmlBody).toContain('token=abc&amp;email=ada%40example.org');
			} finally {
				await fake.close();
			}
		});
	});

	it('reports a refused message to the sender and stores nothing', async () => {
		await inRollback(async (tx) => {
			let refusals = 1;
			const fake = await startFakeSmtp({ port: getEnv().MAIL_FAKE_PORT, store: (m) => insertMailMessage(tx, m), refuse: () => refusals-- > 0 });
			try {
				await expect(sendMail(signInMessage('ravi@example.org', 'http://x/', 'x'))).rejects.toThrow(/451|temporarily/);
				expect(await listMailMessages(tx)).toHaveLength(0);
				await sendMail(signInMessage('ravi@example.org', 'http://x/', 'x'));
				expect(await listMailMessages(tx)).toHaveLength(1);
			} finally {
				await fake.close();
			}
		});
	});
});
