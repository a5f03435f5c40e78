import type { OutgoingMail } from './transport';

/** HTML-escapes text for the HTML part of a message (never used for the plain-text part). */
export function escapeHtml(s: string): string {
	return s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] ?? c);
}

/** The sign-in message: the link in plain text as is, and HTML-escaped in the HTML part. */
export function signInMessage(to: string, url: string, host: string): OutgoingMail {
	return {
		to,
		subject: `Sign in to Phasewright (${host})`,
		text: `Use this link to sign in to Phasewright at ${host}:\n\n${url}\n\nThe link works once and expires in 24 hours. If you did not ask for it, ignore this message.\n`,
		html: `<p>Use this link to sign in to Phasewright at ${escapeHtml(host)}:</p><p><a href="${escapeHtml(url)}">Sign in to Phasewright</a></p><p>The link works once and expires in 24 hours. If you did not ask for it, ignore this message.</p>`
	};
}
