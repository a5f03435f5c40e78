import type { Executor } from '../db/client';
import { getDb, isDatabaseUnavailable } from '../db/client';
import { claimDueNotifications, markNotificationAttemptFailed, markNotificationSent } from '../db/queries/notifications';
import { buildNotificationMail } from './notification-messages';
import { sendMail, type OutgoingMail } from './transport';

/** Failed sends after which a message is marked `failed` (visible to admins) instead of retried. */
export const MAX_SEND_ATTEMPTS = 6;
const BASE_RETRY_MS = 60_000;
const MAX_ERROR_CHARS = 1000;

/** Wait before the next try after `attempts` failed sends: 1 min, 2 min, 4 min, … */
export function computeRetryDelayMs(attempts: number): number {
	return BASE_RETRY_MS * 2 ** Math.max(0, attempts - 1);
}

export type ProcessResult = { sent: number; retrying: number; failed: number };

function describeError(e: unknown): string {
	const message = e instanceof Error ? e.message : String(e);
	return message.slice(0, MAX_ERROR_CHARS);
}

/**
 * Sends the messages that are due: claims them (FOR UPDATE SKIP LOCKED, so parallel workers
 * never take the same row), sends each, and marks it sent or schedules a retry with back-off.
 * The rows stay locked while they are being sent; a crash in the middle leaves them pending.
 */
export async function processNotifications(
	db: Executor,
	opts: { now: Date; send: (mail: OutgoingMail) => Promise<void>; baseUrl: string; limit?: number }
): Promise<ProcessResult> {
	return db.transaction(async (tx) => {
		const due = await claimDueNotifications(tx, opts.now, opts.limit ?? 20);
		const result: ProcessResult = { sent: 0, retrying: 0, failed: 0 };
		for (const n of due) {
			try {
				await opts.send(buildNotificationMail({ kind: n.kind, to: n.recipientEmail, linkPath: n.linkPath, payload: n.payload }, opts.baseUrl));
				await markNotificationSent(tx, n.id, opts.now);
				result.sent++;
			} catch (e) {
				const attempts = n.attempts + 1;
				const giveUp = attempts >= MAX_SEND_ATTEMPTS;
				const nextAttemptAt = giveUp ? opts.now : new Date(opts.now.getTime() + computeRetryDelayMs(attempts));
				await markNotificationAttemptFailed(tx, n.id, { attempts, error: describeError(e), nextAttemptAt, giveUp });
				if (giveUp) result.failed++;
				else result.retrying++;
			}
		}
		return result;
	});
}

/**
 * Runs `processNotifications` every `intervalMs` (never two runs at once) until the returned
 * function is called; that function resolves once a run in progress has finished.
 */
export function startNotificationWorker(opts: {
	intervalMs: number;
	baseUrl: string;
	db?: Executor;
	send?: (mail: OutgoingMail) => Promise<void>;
}): () => Promise<void> {
	let stopped = false;
	let timer: ReturnType<typeof setTimeout> | null = null;
	let running: Promise<void> | null = null;
	const tick = (): void => {
		timer = null;
		if (stopped) return;
		// Started inside a promise so that even a synchronous failure (bad configuration) is caught.
		running = Promise.resolve()
			.then(() => processNotifications(opts.db ?? getDb(), { now: new Date(), send: opts.send ?? sendMail, baseUrl: opts.baseUrl }))
			.then(
				() => undefined,
				(e: unknown) => {
					// The database may be down for a while: say so once per run and try again later.
					const why = isDatabaseUnavailable(e) ? 'database unavailable' : describeError(e);
					console.error(`[mail] notification worker run failed (${why}); retrying in ${opts.intervalMs} ms`);
				}
			)
			.finally(() => {
				running = null;
				if (!stopped) timer = setTimeout(tick, opts.intervalMs);
			});
	};
	timer = setTimeout(tick, 0);
	return async () => {
		stopped = true;
		if (timer) clearTimeout(timer);
		timer = null;
		if (running) await running;
	};
}
