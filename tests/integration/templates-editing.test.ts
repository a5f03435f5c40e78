import { describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { inRollback } from './db';
import { seedDemo } from '../../src/lib/server/services/seed';
import { createRecipe, saveVersion } from '../../src/lib/server/services/recipes';
import { checkPythonSyntax, createTeamTemplateVersion, moveRecipeToTemplate, startTeamTemplate } from '../../src/lib/server/services/template-editing';
import { templateFilesSha256 } from '../../src/lib/server/services/templates';
import { listAudit } from '../../src/lib/server/services/audit';
import { STARTER_FILES } from '../../src/lib/server/templates/starter';
import { getRecipeVersion } from '../../src/lib/server/db/queries/recipes';
import { getTemplateVersionById } from '../../src/lib/server/db/queries/templates';
import { listObservations } from '../../src/lib/server/db/queries/observations';
import { getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import { findUserByEmail } from '../../src/lib/server/db/queries/users';
import { templateVersions } from '../../src/lib/server/db/schema';
import type { Executor } from '../../src/lib/server/db/client';

const NOW = new Date('2026-12-01T12:00:00Z');
const ENTRY = 'python/calibrate.py.hbs';
const COMMON = 'partials/common.hbs';

// Invented demo teams (services/seed.ts): Lena leads Stellar Nurseries, Ada is a member.
async function setUp(tx: Executor) {
	await seedDemo(tx);
	const team = await getTeamBySlug(tx, 'stellar-nurseries');
	const other = await getTeamBySlug(tx, 'tidewater-transients');
	const lena = await findUserByEmail(tx, 'lena@stellar-nurseries.example');
	const ada = await findUserByEmail(tx, 'ada@stellar-nurseries.example');
	const tomas = await findUserByEmail(tx, 'tomas@tidewater.example');
	if (!team || !other || !lena || !ada || !tomas) throw new Error('seed incomplete');
	return { team, other, lena: lena.id, ada: ada.id, tomas: tomas.id };
}

function withLine(files: Readonly<Record<string, string>>, path: string, line: string): Record<string, string> {
	return { ...files, [path]: `${files[path] ?? ''}\n${line}\n` };
}

describe('python parser check', () => {
	it('accepts valid Python, reports a syntax error with its line, and says when python3 is missing', async () => {
		// Python's grammar (docs.python.org, "Function definitions"): a parameter list needs a closing parenthesis.
		expect(await checkPythonSyntax('x = 1\n\ndef f(a, b):\n    return a + b\n')).toEqual({ status: 'passed' });
		const bad = await checkPythonSyntax('x = 1\ny = 2\ndef broken(:\n    pass\n');
		expect(bad).toMatchObject({ status: 'failed', line: 3 });
		const missing = await checkPythonSyntax('x = 1\n', { pythonCommand: '/nonexistent/python3' });
		expect(missing.status === 'skipped' && missing.reason).toMatch(/not installed/);
	});
});

describe('team template versions', () => {
	it('starts a team template as a copy of the starter set, for leads only', async () => {
		await inRollback(async (tx) => {
			const { team, lena, ada } = await setUp(tx);
			const denied = await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: ada });
			expect(denied.ok ? null : denied.error.code).toBe('forbidden');
			const reserved = await startTeamTemplate(tx, { teamId: team.id, name: 'standard', userId: lena });
			expect(reserved.ok ? null : reserved.error.message).toMatch(/starter set's name/);
			const r = await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			if (!r.ok) throw new Error(r.error.message);
			expect(r.value).toMatchObject({ version: 1, teamId: team.id, templateName: 'survey', authorId: lena });
			expect(r.value.files).toEqual(STARTER_FILES);
			expect(r.value.sha256).toBe(templateFilesSha256(STARTER_FILES));
			const again = await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			expect(again.ok ? null : again.error.code).toBe('conflict');
		});
	});

	it('stores an edited set as the next immutable version with hash, changelog and author', async () => {
		await inRollback(async (tx) => {
			const { team, lena, ada } = await setUp(tx);
			const start = await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			if (!start.ok) throw new Error(start.error.message);
			const files = withLine(STARTER_FILES, COMMON, '# Stellar Nurseries house style');
			const byMember = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'House style', authorId: ada });
			expect(byMember.ok ? null : byMember.error.code).toBe('forbidden');
			const r = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'House style comment', authorId: lena });
			if (!r.ok) throw new Error(r.error.message);
			expect(r.value.pythonCheck).toEqual({ status: 'passed' });
			expect(r.value.version).toMatchObject({ version: 2, changelog: 'House style comment', authorId: lena, sha256: templateFilesSha256(files) });
			const same = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'again', authorId: lena });
			expect(same.ok ? null : same.error.message).toMatch(/identical to version 2/);
			const third = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files: withLine(files, COMMON, '# third'), changelog: 'Third', authorId: lena });
			expect(third.ok && third.value.version.version).toBe(3);
			// Earlier versions are untouched, and the database refuses to change them.
			const v1 = await getTemplateVersionById(tx, start.value.id);
			expect(v1?.files).toEqual(STARTER_FILES);
			expect(v1?.sha256).toBe(start.value.sha256);
			await tx.execute(sql`savepoint tv`);
			const err = await tx.update(templateVersions).set({ files }).where(eq(templateVersions.id, start.value.id)).then(() => null, (e: { cause?: Error }) => e);
			expect(String(err?.cause?.message)).toMatch(/template_versions rows are immutable/);
			await tx.execute(sql`rollback to savepoint tv`);
			const audit = await listAudit(tx, team.id);
			expect(audit.ok && audit.value.items.map((a) => a.action)).toEqual(['template.version', 'template.version', 'template.create']);
		});
	});

	it('refuses a set that does not compile under the strict environment, naming the file', async () => {
		await inRollback(async (tx) => {
			const { team, lena } = await setUp(tx);
			await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			const files = withLine(STARTER_FILES, COMMON, 'X = {{{raw}}}');
			const r = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'raw output', authorId: lena });
			expect(r.ok ? null : r.error.code).toBe('validation_failed');
			expect(r.ok ? '' : r.error.message).toMatch(/does not compile: templates\/partials\/common\.hbs/);
			expect(await tx.select().from(templateVersions).where(eq(templateVersions.sha256, templateFilesSha256(files)))).toHaveLength(0);
		});
	});

	it('refuses a set whose demo program Python\'s parser rejects, and reports when the check was skipped', async () => {
		await inRollback(async (tx) => {
			const { team, lena } = await setUp(tx);
			await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			// Not Python: a parameter list without its closing parenthesis (Python language reference).
			const files = withLine(STARTER_FILES, ENTRY, 'def broken(:');
			const r = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'broken', authorId: lena });
			expect(r.ok ? null : r.error.code).toBe('validation_failed');
			expect(r.ok ? '' : r.error.message).toMatch(/not valid Python at line \d+: invalid syntax \(the line reads: "def broken\(:"\)/);
			const skipped = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files, changelog: 'no python here', authorId: lena, pythonCommand: '/nonexistent/python3' });
			expect(skipped.ok && skipped.value.pythonCheck.status).toBe('skipped');
		});
	});

	it('moves a recipe to a team template only as a new version, leaving the old one pinned', async () => {
		await inRollback(async (tx) => {
			const { team, other, lena, ada, tomas } = await setUp(tx);
			const [obs] = await listObservations(tx, team.id);
			if (!obs) throw new Error('no demo observation');
			const recipe = await createRecipe(tx, { teamId: team.id, observationId: obs.id, userId: ada });
			if (!recipe.ok) throw new Error(recipe.error.message);
			expect((await saveVersion(tx, { recipeId: recipe.value.id, userId: ada, message: 'v1', now: NOW })).ok).toBe(true);
			const before = await getRecipeVersion(tx, recipe.value.id, 1);
			await startTeamTemplate(tx, { teamId: team.id, name: 'survey', userId: lena });
			const edited = await createTeamTemplateVersion(tx, { teamId: team.id, name: 'survey', files: withLine(STARTER_FILES, COMMON, '# Stellar Nurseries house style'), changelog: 'House style', authorId: lena });
			if (!edited.ok) throw new Error(edited.error.message);

			const moved = await moveRecipeToTemplate(tx, { recipeId: recipe.value.id, templateVersionId: edited.value.version.id, userId: ada, message: 'Use the team template' });
			if (!moved.ok) throw new Error(moved.error.message);
			expect(moved.value).toMatchObject({ version: 2, to: { name: 'survey', version: 2 }, from: { name: 'standard' } });
			const v1 = await getRecipeVersion(tx, recipe.value.id, 1);
			const v2 = await getRecipeVersion(tx, recipe.value.id, 2);
			expect(v1?.templateVersionId).toBe(before?.templateVersionId);
			expect(v1?.program).toBe(before?.program);
			expect(v2?.templateVersionId).toBe(edited.value.version.id);
			expect(v2?.params).toEqual(v1?.params);
			expect(v2?.program).toContain('# Stellar Nurseries house style');
			const again = await moveRecipeToTemplate(tx, { recipeId: recipe.value.id, templateVersionId: edited.value.version.id, userId: ada, message: '' });
			expect(again.ok ? null : again.error.code).toBe('conflict');
			// Another team's template is not available to this recipe.
			const theirs = await startTeamTemplate(tx, { teamId: other.id, name: 'flare', userId: tomas });
			if (!theirs.ok) throw new Error(theirs.error.message);
			const foreign = await moveRecipeToTemplate(tx, { recipeId: recipe.value.id, templateVersionId: theirs.value.id, userId: ada, message: '' });
			expect(foreign.ok ? null : foreign.error.code).toBe('not_found');
		});
	});
});
