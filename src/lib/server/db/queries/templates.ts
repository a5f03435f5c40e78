import { and, desc, eq, isNull, sql } from 'drizzle-orm';
import type { Executor } from '../client';
import { recipeVersions, scriptTemplates, templateVersions, users } from '../schema';

export type TemplateVersion = {
	id: string;
	templateId: string;
	templateName: string;
	teamId: string | null;
	version: number;
	files: Record<string, string>;
	sha256: string;
	changelog: string;
	authorId: string | null;
	createdAt: Date;
};

const versionColumns = {
	id: templateVersions.id,
	templateId: templateVersions.templateId,
	templateName: scriptTemplates.name,
	teamId: scriptTemplates.teamId,
	version: templateVersions.version,
	files: templateVersions.files,
	sha256: templateVersions.sha256,
	changelog: templateVersions.changelog,
	authorId: templateVersions.authorId,
	createdAt: templateVersions.createdAt
};

export async function findTemplate(db: Executor, name: string, teamId: string | null): Promise<{ id: string } | null> {
	const rows = await db
		.select({ id: scriptTemplates.id })
		.from(scriptTemplates)
		.where(and(eq(scriptTemplates.name, name), teamId === null ? isNull(scriptTemplates.teamId) : eq(scriptTemplates.teamId, teamId)))
		.limit(1);
	return rows[0] ?? null;
}

export async function insertTemplate(db: Executor, t: { name: string; teamId: string | null; description: string }): Promise<{ id: string }> {
	const [row] = await db.insert(scriptTemplates).values(t).onConflictDoNothing().returning({ id: scriptTemplates.id });
	if (row) return row;
	// Another process created it at the same moment.
	const existing = await findTemplate(db, t.name, t.teamId);
	if (!existing) throw new Error('template insert conflicted but no row found');
	return existing;
}

/** The newest version of a template, locking the template row when `forUpdate`. */
export async function getLatestTemplateVersion(db: Executor, templateId: string, forUpdate = false): Promise<TemplateVersion | null> {
	if (forUpdate) await db.select({ id: scriptTemplates.id }).from(scriptTemplates).where(eq(scriptTemplates.id, templateId)).for('update');
	const rows = await db
		.select(versionColumns)
		.from(templateVersions)
		.innerJoin(scriptTemplates, eq(scriptTemplates.id, templateVersions.templateId))
		.where(eq(templateVersions.templateId, templateId))
		.orderBy(desc(templateVersions.version))
		.limit(1);
	return rows[0] ?? null;
}

export async function getTemplateVersionById(db: Executor, id: string): Promise<TemplateVersion | null> {
	const rows = await db
		.select(versionColumns)
		.from(templateVersions)
		.innerJoin(scriptTemplates, eq(scriptTemplates.id, templateVersions.templateId))
		.where(eq(templateVersions.id, id))
		.limit(1);
	return rows[0] ?? null;
}

export async function getTemplateVersionByNumber(db: Executor, templateId: string, version: number): Promise<TemplateVersion | null> {
	const rows = await db
		.select(versionColumns)
		.from(templateVersions)
		.innerJoin(scriptTemplates, eq(scriptTemplates.id, templateVersions.templateId))
		.where(and(eq(templateVersions.templateId, templateId), eq(templateVersions.version, version)))
		.limit(1);
	return rows[0] ?? null;
}

export async function insertTemplateVersion(
	db: Executor,
	v: { templateId: string; version: number; files: Record<string, string>; sha256: string; changelog: string; authorId: string | null }
): Promise<TemplateVersion> {
	const [row] = await db.insert(templateVersions).values(v).returning({ id: templateVersions.id });
	if (!row) throw new Error('insert into template_versions returned no row');
	const stored = await getTemplateVersionById(db, row.id);
	if (!stored) throw new Error('template version vanished after insert');
	return stored;
}

export type TemplateVersionListItem = {
	id: string;
	templateName: string;
	teamId: string | null;
	version: number;
	sha256: string;
	changelog: string;
	authorEmail: string | null;
	createdAt: Date;
	usedBy: number;
};

/** Template versions visible to a team (starter set + the team's own), newest first. */
export async function listTemplateVersions(db: Executor, teamIds: readonly string[]): Promise<TemplateVersionListItem[]> {
	const rows = await db
		.select({
			id: templateVersions.id,
			templateName: scriptTemplates.name,
			teamId: scriptTemplates.teamId,
			version: templateVersions.version,
			sha256: templateVersions.sha256,
			changelog: templateVersions.changelog,
			authorEmail: users.email,
			createdAt: templateVersions.createdAt,
			usedBy: sql<number>`(select count(*)::int from ${recipeVersions} where ${recipeVersions.templateVersionId} = ${templateVersions.id})`
		})
		.from(templateVersions)
		.innerJoin(scriptTemplates, eq(scriptTemplates.id, templateVersions.templateId))
		.leftJoin(users, eq(users.id, templateVersions.authorId))
		.orderBy(scriptTemplates.name, desc(templateVersions.version));
	return rows.filter((r) => r.teamId === null || teamIds.includes(r.teamId));
}
