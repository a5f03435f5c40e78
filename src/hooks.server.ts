import { sequence } from '@sveltejs/kit/hooks';
import type { Handle, HandleServerError, ServerInit } from '@sveltejs/kit';
import { building } from '$app/environment';
import { authHandle } from '$lib/server/auth';
import { closeDb, getDb, isDatabaseUnavailable } from '$lib/server/db/client';
import { getSessionUser } from '$lib/server/db/queries/users';
import { insertMailMessage } from '$lib/server/db/queries/mail';
import { startFakeSmtp, type FakeSmtp } from '$lib/server/mail/fake-smtp';
import { getEnv } from '$lib/server/env';
import { SESSION_COOKIES } from '$lib/server/guards';
import { ensureStarterTemplates } from '$lib/server/services/templates';
import { startNotificationWorker } from '$lib/server/mail/worker';

let fakeSmtp: FakeSmtp | null = null;

export const init: ServerInit = async () => {
	if (building) return;
	const env = getEnv();
	if (env.MAIL_TRANSPORT === 'fake') {
		fakeSmtp = await startFakeSmtp({ port: env.MAIL_FAKE_PORT, store: (m) => insertMailMessage(getDb(), m) });
		console.log(`[mail] fake SMTP server on 127.0.0.1:${fakeSmtp.port}`);
	}
	// Load the bundled starter templates into the store (a new version only when they changed).
	// If the database is down now, the first render retries.
	try {
		const v = await ensureStarterTemplates(getDb());
		console.log(`[templates] starter set ${v.templateName}@${v.version} (${v.sha256.slice(0, 12)})`);
	} catch (e) {
		console.error(`[templates] could not load the starter set yet: ${(e as Error).message}`);
	}
	// Notifications are queued in the database by the actions and sent from here, with retries.
	const stopWorker = startNotificationWorker({ intervalMs: env.NOTIFY_INTERVAL_MS, baseUrl: env.APP_BASE_URL });
	process.once('sveltekit:shutdown', () => {
		void stopWorker();
		void fakeSmtp?.close();
		void closeDb();
	});
};

const userHandle: Handle = async ({ event, resolve }) => {
	event.locals.user = null;
	const token = SESSION_COOKIES.map((n) => event.cookies.get(n)).find((v) => v !== undefined);
	if (token) event.locals.user = await getSessionUser(getDb(), token, new Date());
	return resolve(event);
};

const requestLog: Handle = async ({ event, resolve }) => {
	const started = performance.now();
	const response = await resolve(event);
	if (response.status >= 500) {
		console.warn(`[http] ${event.request.method} ${event.url.pathname} → ${response.status} (${Math.round(performance.now() - started)} ms)`);
	}
	return response;
};

export const handle = sequence(authHandle, userHandle, requestLog);

export const handleError: HandleServerError = ({ error, event, status }) => {
	const errorId = crypto.randomUUID();
	if (isDatabaseUnavailable(error)) {
		console.error(`[error ${errorId}] database unavailable on ${event.url.pathname}`);
		return { message: 'Phasewright cannot reach its database right now. Please try again in a minute.', code: 'internal', errorId };
	}
	if (status === 404) return { message: 'Not found', code: 'not_found' };
	console.error(`[error ${errorId}] ${event.request.method} ${event.url.pathname}`, error);
	return { message: 'Something went wrong on our side. The error has been logged.', code: 'internal', errorId };
};
