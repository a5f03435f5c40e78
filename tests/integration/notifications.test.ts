import { NOW, setUpDemoTeams } from './fixtures';
import { describe, expect, it } from 'vitest';
import { asc, eq } from 'drizzle-orm';
import { inRollback } from './db';
import { addComment, decideReview, submitForReview } from '../../src/lib/server/services/reviews';
import { shareRecipe } from '../../src/lib/server/services/sharing';
import { forkVersion } from '../../src/lib/server/services/forks';
import { getNotificationSettings, listFailedNotifications, retryFailedNotification, setNotificationSetting } from '../../src/lib/server/services/notifications';
import { computeRetryDelayMs, MAX_SEND_ATTEMPTS, processNotifications, startNotificationWorker } from '../../src/lib/server/mail/worker';
import { startFakeSmtp } from '../../src/lib/server/mail/fake-smtp';
import { sendMail } from '../../src/lib/server/mail/transport';
import { insertMailMessage, listMailMessages, type NewMailMessage } from '../../src/lib/server/db/queries/mail';
import { notifications, users } from '../../src/lib/server/db/schema';
import { getEnv } from '../../src/lib/server/env';
import type { Executor } from '../../src/lib/server/db/client';

const BASE_URL = 'http://127.0.0.1:4183';
const minutes = (m: number): Date => new Date(NOW.getTime() + m * 60_000);
// A title with characters HTML gives meaning to: they must reach the plain text unchanged.
const TITLE = 'Bandpass & gain <L-band> "night 1"';

async function setUp(tx: Executor) {
	const f = await setUpDemoTeams(tx, { title: TITLE });
	const v1 = await f.save(f.recipeId, f.people.ada, 'v1');
	return { ...f, versionId: v1.id };
}

async function queued(tx: Executor) {
	const rows = await tx
		.select({ kind: notifications.kind, to: users.email, status: notifications.status, attempts: notifications.attempts, linkPath: notifications.linkPath })
		.from(notifications)
		.innerJoin(users, eq(users.id, notifications.recipientId))
		.orderBy(asc(notifications.createdAt), asc(users.email));
	return rows;
}

function fakeSmtp(tx: Executor, refuse?: () => boolean) {
	let stored: (m: NewMailMessage) => void = () => undefined;
	const arrivals: NewMailMessage[] = [];
	return {
		arrivals,
		nextArrival: () => new Promise<NewMailMessage>((resolve) => (stored = resolve)),
		start: () =>
			startFakeSmtp({
				port: getEnv().MAIL_FAKE_PORT,
				store: async (m) => {
					await insertMailMessage(tx, m);
					arrivals.push(m);
					stored(m);
				},
				...(refuse ? { refuse } : {})
			})
	};
}

describe('notification rows per kind', () => {
	it('queues review_requested for the reviewers and leads, not the author', async () => {
		await inRollback(async (tx) => {
			const { people, recipeId, versionId } = await setUp(tx);
			const r = await submitForReview(tx, { versionId, userId: people.ada, now: minutes(1) });
			expect(r.ok && r.value.notified).toBe(2);
			expect(await queued(tx)).toEqual([
				{ kind: 'review_requested', to: 'lena@stellar-nurseries.example', status: 'pending', attempts: 0, linkPath: `/recipes/${recipeId}/versions/1/reviews` },
				{ kind: 'review_requested', to: 'ravi@stellar-nurseries.example', status: 'pending', attempts: 0, linkPath: `/recipes/${recipeId}/versions/1/reviews` }
			]);
		});
	});

	it('queues review_decided for the author and comment_added for the author and earlier commenters', async () => {
		await inRollback(async (tx) => {
			const { people, versionId } = await setUp(tx);
			await submitForReview(tx, { versionId, userId: people.ada, now: minutes(1) });
			await tx.delete(notifications);
			await addComment(tx, { versionId, userId: people.lena, body: 'First look', now: minutes(2) });
			await addComment(tx, { versionId, userId: people.ravi, body: 'Line 40 needs a longer interval', programLine: 40, now: minutes(3) });
			await decideReview(tx, { versionId, userId: people.ravi, decision: 'request_changes', now: minutes(4) });
			expect((await queued(tx)).map((q) => [q.kind, q.to])).toEqual([
				['comment_added', 'ada@stellar-nurseries.example'],
				['comment_added', 'ada@stellar-nurseries.example'],
				['comment_added', 'lena@stellar-nurseries.example'],
				['review_decided', 'ada@stellar-nurseries.example']
			]);
		});
	});

	it('queues recipe_forked for the source team\'s leads', async () => {
		await inRollback(async (tx) => {
			const { other, people, recipeId } = await setUp(tx);
			await shareRecipe(tx, { recipeId, userId: people.lena });
			const fork = await forkVersion(tx, { sourceRecipeId: recipeId, version: 1, targetTeamId: other.id, userId: people.ines, now: minutes(1) });
			if (!fork.ok) throw new Error(fork.error.message);
			expect((await queued(tx)).map((q) => [q.kind, q.to, q.linkPath])).toEqual([['recipe_forked', 'lena@stellar-nurseries.example', `/recipes/${recipeId}/versions/1`]]);
		});
	});

	it('skips people who turned a kind off, and only that kind', async () => {
		await inRollback(async (tx) => {
			const { people, versionId } = await setUp(tx);
			expect(await getNotificationSettings(tx, people.ravi)).toEqual({ review_requested: true, review_decided: true, comment_added: true, recipe_forked: true });
			const set = await setNotificationSetting(tx, { userId: people.ravi, kind: 'review_requested', enabled: false });
			expect(set.ok && set.value.review_requested).toBe(false);
			await setNotificationSetting(tx, { userId: people.ada, kind: 'comment_added', enabled: false });
			await submitForReview(tx, { versionId, userId: people.ada, now: minutes(1) });
			await addComment(tx, { versionId, userId: people.ravi, body: 'noted', now: minutes(2) });
			await decideReview(tx, { versionId, userId: people.ravi, decision: 'approve', now: minutes(3) });
			expect((await queued(tx)).map((q) => [q.kind, q.to])).toEqual([
				['review_requested', 'lena@stellar-nurseries.example'],
				['review_decided', 'ada@stellar-nurseries.example']
			]);
			const bad = await setNotificationSetting(tx, { userId: people.ada, kind: 'everything', enabled: false });
			expect(bad.ok ? null : bad.error.issues?.[0]?.message).toMatch(/Choose one of the notification kinds/);
		});
	});
});

describe('sending through the worker to the local fake SMTP server', () => {
	it('delivers queued messages with the link, plain text unescaped and HTML escaped, and marks them sent', async () => {
		await inRollback(async (tx) => {
			const { people, recipeId, versionId } = await setUp(tx);
			await submitForReview(tx, { versionId, userId: people.ada, now: minutes(1) });
			const smtp = fakeSmtp(tx);
			const fake = await smtp.start();
			try {
				const r = await processNotifications(tx, { now: minutes(1), send: sendMail, baseUrl: BASE_URL });
				expect(r).toEqual({ sent: 2, retrying: 0, failed: 0 });
				const mail = await listMailMessages(tx);
				expect(mail.map((m) => m.envelopeTo).sort()).toEqual([['lena@stellar-nurseries.example'], ['ravi@stellar-nurseries.example']]);
				const m = mail[0];
				const link = `${BASE_URL}/recipes/${recipeId}/versions/1/reviews`;
				expect(m?.subject).toBe(`Review requested: ${TITLE} v1`);
				expect(m?.textBody).toContain(`"${TITLE}" version 1`);
				expect(m?.textBody).toContain(link);
				expect(m?.textBody).not.toContain('&amp;');
				expect(m?.htmlBody).toContain('Bandpass &amp; gain &lt;L-band&gt; &quot;night 1&quot;');
				expect(m?.htmlBody).toContain(`href="${link}"`);
				expect((await queued(tx)).map((q) => q.status)).toEqual(['sent', 'sent']);
				// Nothing is sent twice.
				expect(await processNotifications(tx, { now: minutes(2), send: sendMail, baseUrl: BASE_URL })).toEqual({ sent: 0, retrying: 0, failed: 0 });
			} finally {
				await fake.close();
			}
		});
	});

	it('retries a message the server refused once, after the back-off', async () => {
		await inRollback(async (tx) => {
			const { people, versionId } = await setUp(tx);
			await submitForReview(tx, { versionId, userId: people.ada, now: minutes(1) });
			await decideReview(tx, { versionId, userId: people.ravi, decision: 'approve', now: minutes(2) });
			await tx.delete(notifications).where(eq(notifications.kind, 'review_requested'));
			let refusals = 1;
			const smtp = fakeSmtp(tx, () => refusals-- > 0);
			const fake = await smtp.start();
			try {
				const first = await processNotifications(tx, { now: minutes(2), send: sendMail, baseUrl: BASE_URL });
				expect(first).toEqual({ sent: 0, retrying: 1, failed: 0 });
				const [row] = await tx.select().from(notifications);
				expect(row?.attempts).toBe(1);
				expect(row?.lastError).toMatch(/451|temporarily/);
				// Back-off of 1 minute after the first failure (project choice, issue 6 brief).
				expect(row?.nextAttemptAt.toISOString()).toBe(minutes(3).toISOString());
				expect(await processNotifications(tx, { now: new Date(minutes(3).getTime() - 1000), send: sendMail, baseUrl: BASE_URL })).toEqual({ sent: 0, retrying: 0, failed: 0 });
				expect(await processNotifications(tx, { now: minutes(3), send: sendMail, baseUrl: BASE_URL })).toEqual({ sent: 1, retrying: 0, failed: 0 });
				const mail = await listMailMessages(tx);
				expect(mail.map((m) => [m.envelopeTo, m.subject])).toEqual([[['ada@stellar-nurseries.example'], `Approved: ${TITLE} v1`]]);
			} finally {
				await fake.close();
			}
		});
	});

	it(`gives up after ${MAX_SEND_ATTEMPTS} refusals, shows the message to admins, and can queue it again`, async () => {
		await inRollback(async (tx) => {
			const { people, versionId } = await setUp(tx);
			await submitForReview(tx, { versionId, userId: people.ada, now: minutes(0) });
			await decideReview(tx, { versionId, userId: people.ravi, decision: 'request_changes', now: minutes(0) });
			await tx.delete(notifications).where(eq(notifications.kind, 'review_requested'));
			const smtp = fakeSmtp(tx, () => true);
			const fake = await smtp.start();
			try {
				let at = minutes(0);
				const outcomes: string[] = [];
				for (let i = 1; i <= MAX_SEND_ATTEMPTS; i++) {
					const r = await processNotifications(tx, { now: at, send: sendMail, baseUrl: BASE_URL });
					outcomes.push(r.failed === 1 ? 'failed' : r.retrying === 1 ? 'retrying' : 'nothing');
					at = new Date(at.getTime() + computeRetryDelayMs(i));
				}
				expect(outcomes).toEqual(['retrying', 'retrying', 'retrying', 'retrying', 'retrying', 'failed']);
				const failed = await listFailedNotifications(tx);
				expect(failed.map((f) => [f.kind, f.recipientEmail, f.attempts])).toEqual([['review_decided', 'ada@stellar-nurseries.example', MAX_SEND_ATTEMPTS]]);
				expect(await listMailMessages(tx)).toHaveLength(0);
				const id = failed[0]?.id ?? '';
				expect((await retryFailedNotification(tx, { id, now: at })).ok).toBe(true);
				expect((await queued(tx)).map((q) => [q.status, q.attempts])).toEqual([['pending', 0]]);
			} finally {
				await fake.close();
			}
		});
	});

	it('doubles the wait after each failed send, starting at one minute', () => {
		// Project choice (issue 6 brief): 1 min × 2^(attempts − 1).
		expect([1, 2, 3, 4, 5].map(computeRetryDelayMs)).toEqual([60_000, 120_000, 240_000, 480_000, 960_000]);
	});

	it('runs in the background until stopped', async () => {
		await inRollback(async (tx) => {
			const { people, versionId } = await setUp(tx);
			await addComment(tx, { versionId, userId: people.ravi, body: 'background test' });
			const smtp = fakeSmtp(tx);
			const fake = await smtp.start();
			try {
				const arrival = smtp.nextArrival();
				const stop = startNotificationWorker({ intervalMs: 20, baseUrl: BASE_URL, db: tx });
				const m = await arrival;
				await stop();
				expect(m.envelopeTo).toEqual(['ada@stellar-nurseries.example']);
				expect(m.subject).toBe(`New comment: ${TITLE} v1`);
				expect(m.textBody).toContain('background test');
				expect((await queued(tx)).map((q) => q.status)).toEqual(['sent']);
			} finally {
				await fake.close();
			}
		});
	});
});
