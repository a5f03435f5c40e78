import type { NotificationKind } from '../db/queries/notifications';
import type { NotificationPayload } from '../db/schema';
import { escapeHtml } from './messages';
import type { OutgoingMail } from './transport';

/** The full link of a message: the site's base URL and the stored page path. */
export function buildNotificationLink(baseUrl: string, linkPath: string): string {
	return `${baseUrl.replace(/\/+$/, '')}${linkPath.startsWith('/') ? linkPath : `/${linkPath}`}`;
}

// Subjects are one line whatever a title contains.
function oneLine(s: string): string {
	return s.replace(/[\r\n\t]+/g, ' ').trim();
}

type Lines = { subject: string; lines: string[] };

function describe(kind: NotificationKind, p: NotificationPayload): Lines {
	const what = `"${p.recipeTitle}" version ${p.version}`;
	switch (kind) {
		case 'review_requested':
			return { subject: `Review requested: ${p.recipeTitle} v${p.version}`, lines: [`${p.actorName} submitted ${what} (${p.teamName}) for review.`] };
		case 'review_decided': {
			const decided = p.decision === 'approved' ? 'approved' : 'requested changes to';
			const lines = [`${p.actorName} ${decided} ${what}.`];
			if (p.note) lines.push('', p.note);
			if (p.decision !== 'approved') lines.push('', 'Save a new version with the changes and submit it for review.');
			return { subject: `${p.decision === 'approved' ? 'Approved' : 'Changes requested'}: ${p.recipeTitle} v${p.version}`, lines };
		}
		case 'comment_added': {
			const where = p.programLine ? ` on line ${p.programLine} of the program` : '';
			const lines = [`${p.actorName} commented${where} on ${what}:`];
			if (p.commentExcerpt) lines.push('', p.commentExcerpt);
			return { subject: `New comment: ${p.recipeTitle} v${p.version}`, lines };
		}
		case 'recipe_forked':
			return { subject: `Forked: ${p.recipeTitle} v${p.version}`, lines: [`${p.actorName} of ${p.forkTeamName ?? 'another team'} forked your team's shared recipe ${what}.`] };
	}
}

/** One notification as an e-mail: plain text as typed, user text escaped only in the HTML part. */
export function buildNotificationMail(n: { kind: NotificationKind; to: string; linkPath: string; payload: NotificationPayload }, baseUrl: string): OutgoingMail {
	const { subject, lines } = describe(n.kind, n.payload);
	const link = buildNotificationLink(baseUrl, n.linkPath);
	const footer = 'You get this e-mail because of your Phasewright notification settings; you can turn each kind off there.';
	const text = `${lines.join('\n')}\n\nOpen it in Phasewright:\n${link}\n\n${footer}\n`;
	const paragraphs: string[] = [];
	let current: string[] = [];
	for (const l of lines) {
		if (l === '') {
			if (current.length > 0) paragraphs.push(current.join('<br>'));
			current = [];
		} else current.push(escapeHtml(l).replace(/\r?\n/g, '<br>'));
	}
	if (current.length > 0) paragraphs.push(current.join('<br>'));
	const html = `${paragraphs.map((p) => `<p>${p}</p>`).join('')}<p><a href="${escapeHtml(link)}">Open it in Phasewright</a></p><p>${escapeHtml(footer)}</p>`;
	return { to: n.to, subject: oneLine(subject), text, html };
}
