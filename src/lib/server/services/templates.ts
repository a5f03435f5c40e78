import type { Executor } from '../db/client';
import { findTemplate, getLatestTemplateVersion, getTemplateVersionByNumber, insertTemplate, insertTemplateVersion, type TemplateVersion } from '../db/queries/templates';
import { canonicalJson } from '$lib/script/canonical-json';
import { textSha256 } from '$lib/script/sha256';
import { compileTemplateSet } from '$lib/script/render';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { STARTER_FILES, STARTER_TEMPLATE_NAME } from '../templates/starter';

/** SHA-256 of a template set: of the canonical JSON of its path → source map. */
export function templateFilesSha256(files: Readonly<Record<string, string>>): string {
	return textSha256(canonicalJson(files));
}

/**
 * Stores the starter set as a new version only when its content changed since the newest
 * stored version; returns the version in force. Safe to run at every start.
 */
export async function syncStarterTemplates(db: Executor, name: string, files: Readonly<Record<string, string>>): Promise<{ version: TemplateVersion; created: boolean }> {
	const compiled = compileTemplateSet(files);
	if (!compiled.ok) throw new Error(`The starter templates in templates/ do not compile: ${compiled.error.message}`);
	return db.transaction(async (tx) => {
		const template = (await findTemplate(tx, name, null)) ?? (await insertTemplate(tx, { name, teamId: null, description: 'Starter template set shipped with Phasewright' }));
		const latest = await getLatestTemplateVersion(tx, template.id, true);
		const sha256 = templateFilesSha256(files);
		if (latest && latest.sha256 === sha256) return { version: latest, created: false };
		const version = await insertTemplateVersion(tx, {
			templateId: template.id,
			version: (latest?.version ?? 0) + 1,
			files: { ...files },
			sha256,
			changelog: latest ? 'Starter set updated from the templates/ folder' : 'Starter set as shipped',
			authorId: null
		});
		return { version, created: true };
	});
}

/** Finds `name@version` (or the newest version when `version` is null) among starter and team templates. */
export async function resolveTemplateVersion(db: Executor, name: string, version: number | null, teamId: string | null): Promise<DomainResult<TemplateVersion>> {
	const template = (teamId ? await findTemplate(db, name, teamId) : null) ?? (await findTemplate(db, name, null));
	if (!template) return fail('not_found', `No script template named "${name}".`);
	const v = version === null ? await getLatestTemplateVersion(db, template.id) : await getTemplateVersionByNumber(db, template.id, version);
	if (!v) return fail('not_found', version === null ? `Template "${name}" has no versions yet.` : `Template "${name}" has no version ${version}.`);
	return { ok: true, value: v };
}

let starterSynced: Promise<TemplateVersion> | null = null;

/** Loads the bundled starter set into the store once per process (at start, or on first use). */
export function ensureStarterTemplates(db: Executor): Promise<TemplateVersion> {
	starterSynced ??= syncStarterTemplates(db, STARTER_TEMPLATE_NAME, STARTER_FILES).then(
		(r) => r.version,
		(e: unknown) => {
			starterSynced = null; // retry on the next call (e.g. the database was down)
			throw e;
		}
	);
	return starterSynced;
}
