import { SvelteKitAuth } from '@auth/sveltekit';
import Nodemailer from '@auth/sveltekit/providers/nodemailer';
import { DrizzleAdapter } from '@auth/drizzle-adapter';
import { getDb } from './db/client';
import { accounts, sessions, users, verificationTokens } from './db/schema';
import { getEnv } from './env';
import { sendMail, smtpSettings } from './mail/transport';
import { signInMessage } from './mail/messages';
import { findUserByEmail } from './db/queries/users';

export const SIGN_IN_LINK_MAX_AGE_S = 24 * 3600;

// The configuration is built per request (lazily), so importing this module during
// `vite build` never opens a database connection.
export const { handle: authHandle, signIn, signOut } = SvelteKitAuth(async () => {
	const env = getEnv();
	const db = getDb();
	return {
		adapter: DrizzleAdapter(db, { usersTable: users, accountsTable: accounts, sessionsTable: sessions, verificationTokensTable: verificationTokens }),
		secret: env.AUTH_SECRET,
		trustHost: env.AUTH_TRUST_HOST,
		session: { strategy: 'database', maxAge: env.SESSION_MAX_AGE_S },
		logger: {
			// A used or expired link is an expected event (the person sees a clear page): one line, no stack.
			error(e: Error) {
				if (e.name === 'Verification') console.warn('[auth] sign-in link rejected: used already or expired');
				else console.error('[auth]', e);
			}
		},
		pages: { signIn: '/signin', verifyRequest: '/signin/check-email', error: '/signin/problem' },
		providers: [
			Nodemailer({
				server: smtpSettings(),
				from: env.MAIL_FROM,
				maxAge: SIGN_IN_LINK_MAX_AGE_S,
				async sendVerificationRequest({ identifier, url }) {
					await sendMail(signInMessage(identifier, url, new URL(url).host));
				}
			})
		],
		callbacks: {
			// Only people a lead or an admin has added may sign in; nobody is created here.
			async signIn({ user }) {
				if (!user.email) return false;
				return (await findUserByEmail(getDb(), user.email)) !== null;
			}
		}
	};
});
