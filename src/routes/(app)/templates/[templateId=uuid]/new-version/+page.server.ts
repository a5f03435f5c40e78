import { error, fail } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { statusFor } from '$lib/server/http';
import { createTeamTemplateVersion } from '$lib/server/services/template-editing';
import { describeScope, loadTemplateFor } from '../../template-access.server';

export type NewTemplateVersionPageData = {
	template: { id: string; name: string; scope: string };
	base: { version: number; sha256: string };
	files: { path: string; text: string }[];
};

const STARTER_READ_ONLY = 'The starter set is changed only in the templates/ folder of the code base. Start a team template (a copy of it) on the Templates page and edit that instead.';

export const load: PageServerLoad = async (event): Promise<NewTemplateVersionPageData> => {
	const { latest, teamName } = await loadTemplateFor(event, event.params.templateId, 'template.manage');
	if (latest.teamId === null) error(403, { message: STARTER_READ_ONLY, code: 'forbidden' });
	return {
		template: { id: latest.templateId, name: latest.templateName, scope: describeScope(teamName) },
		base: { version: latest.version, sha256: latest.sha256 },
		files: Object.entries(latest.files)
			.map(([path, text]) => ({ path, text }))
			.sort((a, b) => (a.path < b.path ? -1 : 1))
	};
};

// Browsers send a textarea's line breaks as CRLF; template files keep LF so the hash and the
// rendered program do not change because the form was posted.
const normaliseNewlines = (text: string): string => text.replace(/\r\n?/g, '\n');

export const actions: Actions = {
	saveVersion: async (event) => {
		const { user, latest } = await loadTemplateFor(event, event.params.templateId, 'template.manage', 'action');
		if (latest.teamId === null) return fail(403, { message: STARTER_READ_ONLY, issues: [], changelog: '', files: null });
		const form = await event.request.formData();
		const changelog = String(form.get('changelog') ?? '');
		const files: Record<string, string> = {};
		for (const [key, value] of form.entries()) {
			if (key.startsWith('file:') && typeof value === 'string') files[key.slice(5)] = normaliseNewlines(value);
		}
		const refuse = (status: number, message: string, issues: { path: string; message: string }[] = []) => fail(status, { message, issues, changelog, files });
		const base = String(form.get('baseVersion') ?? '');
		if (!/^[1-9][0-9]{0,8}$/.test(base)) return refuse(400, 'The form does not say which version you edited (baseVersion); reload the page and make your changes again.');
		if (Number(base) !== latest.version) {
			return refuse(409, `Version ${latest.version} of "${latest.templateName}" was saved after you opened the editor on version ${base}. Copy your changes, reload the page, and apply them to version ${latest.version}.`);
		}
		const r = await createTeamTemplateVersion(getDb(), { teamId: latest.teamId, name: latest.templateName, files, changelog, authorId: user.id });
		if (!r.ok) return refuse(statusFor(r.error.code), r.error.message, r.error.issues ?? []);
		const v = r.value.version;
		return { saved: { templateId: v.templateId, version: v.version, sha256: v.sha256, pythonCheck: r.value.pythonCheck } };
	}
};
