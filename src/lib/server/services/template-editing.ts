import { spawn } from 'node:child_process';
import { z } from 'zod';
import type { Executor } from '../db/client';
import { getObservation } from '../db/queries/observations';
import { getLatestVersionNumber, getRecipe, getRecipeVersion, insertRecipeVersion } from '../db/queries/recipes';
import { getRulePolicy } from '../db/queries/teams';
import { findTemplate, getLatestTemplateVersion, getTemplateVersionById, insertTemplate, insertTemplateVersion, type TemplateVersion } from '../db/queries/templates';
import { STARTER_FILES, STARTER_TEMPLATE_NAME } from '../templates/starter';
import { createDefaultRecipe } from '$lib/calibration/defaults';
import { createDemoObservation } from '$lib/calibration/demo-observation';
import { hasErrors, validate, type Finding } from '$lib/calibration/validate';
import { buildRenderContext } from '$lib/script/render-context';
import { compileTemplateSet } from '$lib/script/render';
import { paramsSha256 } from '$lib/script/sha256';
import { TemplateError } from '$lib/script/template-error';
import { can } from '$lib/workflow/permissions';
import { fail, type DomainResult } from '$lib/workflow/errors';
import { loadActor, recordAudit } from './audit';
import { inResultTransaction } from '../db/transaction';
import { renderWithTemplate } from './render';
import { syncStarterTemplates, templateFilesSha256 } from './templates';

export type PythonCheck = { status: 'passed' } | { status: 'skipped'; reason: string } | { status: 'failed'; line: number | null; message: string };

const PARSE_PROGRAM = 'import ast,sys; ast.parse(sys.stdin.read())';

/**
 * Asks python3's own parser whether `program` is valid Python. Reports `skipped` (with the
 * reason) when python3 is not installed or does not answer within `timeoutMs`.
 */
export function checkPythonSyntax(program: string, opts: { pythonCommand?: string; timeoutMs?: number } = {}): Promise<PythonCheck> {
	const command = opts.pythonCommand ?? 'python3';
	const timeoutMs = opts.timeoutMs ?? 10_000;
	return new Promise((resolve) => {
		let settled = false;
		const done = (r: PythonCheck): void => {
			if (!settled) {
				settled = true;
				resolve(r);
			}
		};
		const child = spawn(command, ['-c', PARSE_PROGRAM], { stdio: ['pipe', 'ignore', 'pipe'], env: { ...process.env, PYTHONIOENCODING: 'utf-8' } });
		const timer = setTimeout(() => {
			child.kill('SIGKILL');
			done({ status: 'skipped', reason: `${command} did not answer within ${timeoutMs / 1000} s, so the program was not checked with Python's parser.` });
		}, timeoutMs);
		let stderr = '';
		child.stderr.setEncoding('utf8');
		child.stderr.on('data', (c: string) => {
			if (stderr.length < 20_000) stderr += c;
		});
		child.on('error', (e: NodeJS.ErrnoException) => {
			clearTimeout(timer);
			done({ status: 'skipped', reason: e.code === 'ENOENT' ? `${command} is not installed on the server, so the program was not checked with Python's parser.` : `${command} could not be started (${e.message}); the program was not checked with Python's parser.` });
		});
		child.on('close', (code) => {
			clearTimeout(timer);
			if (code === 0) return done({ status: 'passed' });
			const lines = stderr.trim().split('\n');
			const last = lines[lines.length - 1] ?? '';
			const lineMatch = [...stderr.matchAll(/File "<unknown>", line (\d+)/g)].pop();
			done({ status: 'failed', line: lineMatch?.[1] ? Number(lineMatch[1]) : null, message: last.replace(/^\w*Error: /, '') || `${command} exited with status ${code}` });
		});
		child.stdin.on('error', () => undefined); // python may exit before reading everything
		child.stdin.end(program, 'utf8');
	});
}

const TEMPLATE_PATH = /^(?:[a-z0-9_-]+\/)*[a-z0-9_.-]+\.hbs$/;

const templateNameSchema = z
	.string()
	.regex(/^[a-z0-9][a-z0-9-]{0,62}$/, { message: 'Use 1 to 63 lower-case letters, digits and hyphens, starting with a letter or digit (e.g. "survey-standard").' })
	.refine((n) => n !== STARTER_TEMPLATE_NAME, { message: `"${STARTER_TEMPLATE_NAME}" is the starter set's name; choose another name for the team's template.` });

const templateVersionInputSchema = z.object({
	name: templateNameSchema,
	files: z
		.record(
			z.string().max(200).regex(TEMPLATE_PATH, { message: 'A template file path is relative, like python/calibrate.py.hbs or partials/solve.hbs.' }),
			z.string().max(512 * 1024, { message: 'A template file is at most 512 KiB.' })
		)
		.refine((f) => Object.keys(f).length > 0, { message: 'The template set has no files.' }),
	changelog: z.string().trim().min(1, { message: 'Say what changed in this version (the changelog is shown beside it).' }).max(2000, { message: 'The changelog is at most 2000 characters.' })
});

export type CreatedTemplateVersion = { version: TemplateVersion; pythonCheck: PythonCheck };

// The recipe id the demo render puts in its header; no recipe has it.
const DEMO_RECIPE_ID = '00000000-0000-0000-0000-000000000000';

/** Compiles a template set strictly, renders the demo recipe with it and returns the program. */
function renderDemo(files: Readonly<Record<string, string>>, name: string, version: number): DomainResult<string> {
	const compiled = compileTemplateSet(files);
	if (!compiled.ok) {
		return fail('validation_failed', `The template set does not compile: ${compiled.error.message}`, [{ path: compiled.error.file ?? 'files', message: compiled.error.reason }]);
	}
	const observation = createDemoObservation();
	try {
		const program = compiled.value.render(
			buildRenderContext({ recipe: createDefaultRecipe(observation), observation, recipeId: DEMO_RECIPE_ID, recipeVersion: 1, templateName: name, templateVersion: version })
		);
		return { ok: true, value: program };
	} catch (e) {
		if (e instanceof TemplateError) return fail('validation_failed', `The template set compiles but cannot render the demo recipe: ${e.message}`, [{ path: e.file ?? 'files', message: e.reason }]);
		throw e;
	}
}

/** A lead starts a team template as a copy of the starter set in force (its version 1). */
export async function startTeamTemplate(db: Executor, input: { teamId: string; name: string; userId: string; now?: Date }): Promise<DomainResult<TemplateVersion>> {
	const name = templateNameSchema.safeParse(input.name);
	if (!name.success) return fail('validation_failed', `The template name is not valid: ${name.error.issues[0]?.message ?? ''}`, [{ path: 'name', message: name.error.issues[0]?.message ?? 'invalid' }]);
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting || !can(acting.actor, 'template.manage', { teamId: input.teamId })) return fail('forbidden', "Only the team's leads can create its script templates.");
		if (await findTemplate(tx, name.data, input.teamId)) return fail('conflict', `The team already has a template named "${name.data}"; edit it to make a new version.`);
		const { version: starter } = await syncStarterTemplates(tx, STARTER_TEMPLATE_NAME, STARTER_FILES);
		const template = await insertTemplate(tx, { name: name.data, teamId: input.teamId, description: `Team template, started from ${starter.templateName}@${starter.version}` });
		const version = await insertTemplateVersion(tx, {
			templateId: template.id,
			version: 1,
			files: { ...starter.files },
			sha256: starter.sha256,
			changelog: `Copy of the starter set ${starter.templateName} version ${starter.version}`,
			authorId: input.userId
		});
		await recordAudit(tx, { teamId: input.teamId, actorId: input.userId, action: 'template.create', subjectType: 'template_version', subjectId: version.id, details: { name: name.data, version: 1, copiedFrom: { name: starter.templateName, version: starter.version } }, ...(input.now ? { now: input.now } : {}) });
		return { ok: true, value: version };
	});
}

/**
 * A lead saves edited files as the next immutable version of a team template, after checking
 * that they compile strictly and render the demo recipe into a program Python's parser accepts.
 */
export async function createTeamTemplateVersion(
	db: Executor,
	input: { teamId: string; name: string; files: unknown; changelog: string; authorId: string; now?: Date; pythonCommand?: string }
): Promise<DomainResult<CreatedTemplateVersion>> {
	const parsed = templateVersionInputSchema.safeParse({ name: input.name, files: input.files, changelog: input.changelog });
	if (!parsed.success) {
		return fail('validation_failed', 'The template version is not valid.', parsed.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
	}
	const { name, files, changelog } = parsed.data;
	const acting = await loadActor(db, input.authorId);
	if (!acting || !can(acting.actor, 'template.manage', { teamId: input.teamId })) return fail('forbidden', "Only the team's leads can change its script templates.");
	const template = await findTemplate(db, name, input.teamId);
	if (!template) return fail('not_found', `The team has no template named "${name}"; start one as a copy of the starter set first.`);
	const latestBefore = await getLatestTemplateVersion(db, template.id);
	const demo = renderDemo(files, name, (latestBefore?.version ?? 0) + 1);
	if (!demo.ok) return demo;
	const pythonCheck = await checkPythonSyntax(demo.value, input.pythonCommand ? { pythonCommand: input.pythonCommand } : {});
	if (pythonCheck.status === 'failed') {
		const where = pythonCheck.line !== null ? ` at line ${pythonCheck.line}` : '';
		const text = pythonCheck.line !== null ? demo.value.split('\n')[pythonCheck.line - 1] : undefined;
		const shown = text !== undefined ? ` (the line reads: ${JSON.stringify(text.trim().slice(0, 120))})` : '';
		return fail('validation_failed', `The demo recipe rendered with this template set is not valid Python${where}: ${pythonCheck.message}${shown}. Fix the template text that produces that line.`, [{ path: 'files', message: `python: ${pythonCheck.message}${where}` }]);
	}
	const sha256 = templateFilesSha256(files);
	return inResultTransaction(db, async (tx) => {
		const again = await loadActor(tx, input.authorId);
		if (!again || !can(again.actor, 'template.manage', { teamId: input.teamId })) return fail('forbidden', "Only the team's leads can change its script templates.");
		const latest = await getLatestTemplateVersion(tx, template.id, true);
		if (latest && latest.sha256 === sha256) return fail('conflict', `These files are identical to version ${latest.version} of "${name}"; change something before saving a new version.`);
		const version = await insertTemplateVersion(tx, { templateId: template.id, version: (latest?.version ?? 0) + 1, files: { ...files }, sha256, changelog, authorId: input.authorId });
		await recordAudit(tx, { teamId: input.teamId, actorId: input.authorId, action: 'template.version', subjectType: 'template_version', subjectId: version.id, details: { name, version: version.version, sha256, pythonCheck: pythonCheck.status }, ...(input.now ? { now: input.now } : {}) });
		return { ok: true, value: { version, pythonCheck } };
	});
}

export type MovedVersion = { version: number; templateVersionId: string; from: { name: string; version: number }; to: { name: string; version: number }; findings: Finding[] };

/**
 * Moves a recipe to another template version by saving a NEW version (the newest version's
 * parameters, rendered with that template version); older versions keep their pin.
 */
export async function moveRecipeToTemplate(
	db: Executor,
	input: { recipeId: string; templateVersionId: string; userId: string; message: string; now?: Date }
): Promise<DomainResult<MovedVersion>> {
	return inResultTransaction(db, async (tx) => {
		const acting = await loadActor(tx, input.userId);
		if (!acting) return fail('unauthenticated', 'Sign in to change recipes.');
		const recipe = await getRecipe(tx, input.recipeId, true);
		if (!recipe || !can(acting.actor, 'recipe.view', { teamId: recipe.teamId })) return fail('not_found', 'No such recipe, or it is not visible to your teams.');
		if (!can(acting.actor, 'recipe.edit', { teamId: recipe.teamId })) return fail('forbidden', "Only members of the recipe's team can save its versions.");
		const target = await getTemplateVersionById(tx, input.templateVersionId);
		if (!target || (target.teamId !== null && target.teamId !== recipe.teamId)) return fail('not_found', "No such template version among the starter set and this team's templates.");
		const latestNo = await getLatestVersionNumber(tx, recipe.id);
		const latest = latestNo > 0 ? await getRecipeVersion(tx, recipe.id, latestNo) : null;
		if (!latest) return fail('conflict', 'This recipe has no saved version yet; save a first version, then move it to another template.');
		const current = await getTemplateVersionById(tx, latest.templateVersionId);
		if (latest.templateVersionId === target.id) return fail('conflict', `Version ${latest.version} already renders with ${target.templateName}@${target.version}.`);
		const observation = recipe.observationId ? ((await getObservation(tx, recipe.observationId))?.summary ?? null) : null;
		const findings = validate(latest.params, observation, await getRulePolicy(tx, recipe.teamId));
		if (hasErrors(findings)) {
			const errors = findings.filter((f) => f.severity === 'error');
			return fail('validation_failed', `Version ${latest.version} has ${errors.length} error finding${errors.length === 1 ? '' : 's'} under the team's current rules; fix them in a new version before moving to another template.`, errors.map((f) => ({ path: f.path, message: `${f.code}: ${f.message}` })));
		}
		const version = latestNo + 1;
		const rendered = renderWithTemplate({ template: target, recipe: latest.params, observation, recipeId: recipe.id, recipeVersion: version });
		if (!rendered.ok) return rendered;
		const message = input.message.trim() === '' ? `Moved to template ${target.templateName}@${target.version}` : input.message;
		const row = await insertRecipeVersion(tx, {
			recipeId: recipe.id,
			version,
			params: latest.params,
			paramsSha256: paramsSha256(latest.params),
			templateVersionId: target.id,
			program: rendered.value.program,
			programSha256: rendered.value.sha256,
			findings,
			message,
			authorId: input.userId
		});
		const from = { name: current?.templateName ?? 'unknown', version: current?.version ?? 0 };
		const to = { name: target.templateName, version: target.version };
		await recordAudit(tx, { teamId: recipe.teamId, actorId: input.userId, action: 'version.save', subjectType: 'recipe_version', subjectId: row.id, details: { recipeId: recipe.id, version, templateMoved: { from, to } }, ...(input.now ? { now: input.now } : {}) });
		return { ok: true, value: { version, templateVersionId: target.id, from, to, findings } };
	});
}
