import { test, expect, hydrated, signInAs } from './fixtures';
import AxeBuilder from '@axe-core/playwright';
import type { Page } from '@playwright/test';
import { readFileSync, writeFileSync, mkdtempSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { tmpdir } from 'node:os';
import path from 'node:path';

// The recipe wizard tried as a new reducer would: upload a summary, walk every screen,
// meet and fix an error the engine reports, save a version, download and run the program.

const STEPS = ['Observation', 'Field roles', 'Flux model', 'Reference antenna', 'Channels', 'Solve chain', 'Review'];

/** A copy of the demo summary under another name (so it is a new upload for the team). */
function summaryCopy(name: string): string {
	const dir = mkdtempSync(path.join(tmpdir(), 'pw-wizard-'));
	const file = path.join(dir, 'session.json');
	const obs = JSON.parse(readFileSync('tests/fixtures/observations/demo.json', 'utf8')) as { name: string };
	obs.name = name;
	writeFileSync(file, JSON.stringify(obs, null, 2));
	return file;
}

async function expectNoSeriousA11yIssues(page: Page, label: string) {
	const results = await new AxeBuilder({ page }).analyze();
	const serious = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
	expect(serious.map((v) => `${label}: ${v.id} (${v.nodes.length})`)).toEqual([]);
}

async function continueTo(page: Page, next: string) {
	await page.getByRole('button', { name: `Save and continue to ${next} →` }).click();
	await expect(page.getByRole('heading', { level: 1, name: next })).toBeVisible();
	await hydrated(page);
}

async function startRecipe(page: Page, name: string): Promise<string> {
	await page.goto('/recipes/new');
	await hydrated(page);
	await page.getByTestId('summary-file').setInputFiles(summaryCopy(name));
	await expect(page.getByRole('radio', { name: new RegExp(name.replace(/[()]/g, '\\$&')) })).toBeChecked();
	await page.getByLabel('Title (optional)').fill(`${name} plan`);
	await page.getByRole('button', { name: 'Start the recipe' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Field roles' })).toBeVisible();
	await hydrated(page);
	const m = /recipes\/([0-9a-f-]{36})\/edit/.exec(page.url());
	if (!m?.[1]) throw new Error('no recipe id in the URL');
	return m[1];
}

test('a reducer goes from an uploaded summary to a saved version and a program that plans', async ({ page, context, baseURL }) => {
	test.setTimeout(90_000);
	await signInAs(context, baseURL ?? '', 'member');
	const id = await startRecipe(page, 'Session 2 (wizard test)');
	await expect(page.getByTestId('progress-rail').getByRole('link')).toHaveText(STEPS.map((s, i) => `${i + 1}${s}`));
	await expectNoSeriousA11yIssues(page, 'roles');
	await expect(page.getByLabel('3C286 is a flux calibrator')).toBeChecked();

	await continueTo(page, 'Flux model');
	await expect(page.getByTestId('flux-at-centre')).toContainText('Jy');
	await page.getByLabel('CFA-GCAL-1 (Jy)').fill('2.3');
	await expectNoSeriousA11yIssues(page, 'flux');

	await continueTo(page, 'Reference antenna');
	await expectNoSeriousA11yIssues(page, 'reference');

	await continueTo(page, 'Channels');
	await expect(page.getByLabel('Clean channels (for the provisional phase solve)')).not.toHaveValue('');
	await page.getByTestId('excluded-input').fill('700–720');
	await page.getByTestId('excluded-input').press('Tab');
	await expectNoSeriousA11yIssues(page, 'channels');

	await continueTo(page, 'Solve chain');
	// Make the provisional phase interval two integrations: shorter than the bandpass scan.
	const prep = page.getByRole('group', { name: /Provisional phase solve/ });
	await prep.getByLabel('Solution interval', { exact: true }).selectOption('seconds');
	await prep.getByLabel('Solution interval in seconds').fill('16');
	await expect(page.getByTestId('findings-count')).toContainText('1 error');
	await expect(page.getByText(/provisional phase interval/i).first()).toBeVisible();
	await expectNoSeriousA11yIssues(page, 'solve');

	await continueTo(page, 'Review');
	await expect(page.getByTestId('findings-count')).toContainText('1 error');
	await expect(page.getByRole('button', { name: 'Save version' })).toBeDisabled();
	await expect(page.getByTestId('code-viewer')).toContainText('# --- parameters ---');
	await expectNoSeriousA11yIssues(page, 'review');

	// The finding leads back to the parameter; fixing it clears the error.
	await page.getByRole('button', { name: /provisional phase interval/i }).first().click();
	await expect(page.getByRole('heading', { level: 1, name: 'Solve chain' })).toBeVisible();
	await hydrated(page);
	const prep2 = page.getByRole('group', { name: /Provisional phase solve/ });
	await prep2.getByLabel('Solution interval', { exact: true }).selectOption('scan');
	await expect(page.getByTestId('findings-count')).toContainText('no errors');
	await continueTo(page, 'Review');
	await expect(page.getByTestId('findings-count')).toContainText('no errors');
	await page.getByLabel('What this version changes').fill('First plan for session 2');
	await page.getByRole('button', { name: 'Save version' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(/— version 1$/);
	await expect(page.getByTestId('params-summary')).toContainText('700–720');
	await expect(page.getByTestId('how-to-run-commands')).toContainText('run BUNDLE.npz --out results');

	const download = page.waitForEvent('download');
	await page.getByRole('link', { name: 'Download the program (.py)' }).click();
	const file = await (await download).path();
	const parsed = spawnSync('python3', ['-c', 'import ast,sys; ast.parse(open(sys.argv[1]).read())', file], { encoding: 'utf8' });
	expect(parsed.status, parsed.stderr).toBe(0);
	const plan = spawnSync('python3', [file, 'plan'], { encoding: 'utf8' });
	expect(plan.status, plan.stderr).toBe(0);
	expect(plan.stdout).toContain('Session 2 (wizard test) plan');
	expect(page.url()).toContain(`/recipes/${id}/versions/1`);
});

test('a bad upload lists its problems on the new-recipe screen', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'member');
	await page.goto('/recipes/new');
	await hydrated(page);
	await page.getByTestId('summary-file').setInputFiles('tests/fixtures/observations/wrong-types.json');
	await expect(page.getByRole('alert')).toContainText('is not a valid phasewright.observation v1 summary');
	await expect(page.getByTestId('upload-issues').getByRole('listitem').first()).toContainText('$.');
});

test('a reload mid-wizard keeps the draft', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'member');
	await startRecipe(page, 'Session 3 (reload test)');
	await continueTo(page, 'Flux model');
	await continueTo(page, 'Reference antenna');
	await page.getByLabel('Primary', { exact: true }).selectOption('CF05');
	await expect(page.getByTestId('save-state')).toContainText('Draft saved (revision');
	await expect(page.getByTestId('save-state')).not.toContainText('revision 3)');
	await page.reload();
	await hydrated(page);
	await expect(page.getByLabel('Primary', { exact: true })).toHaveValue('CF05');
});

test('a second editor with a stale copy gets a conflict, not a silent overwrite', async ({ page, context, baseURL, browser }) => {
	await signInAs(context, baseURL ?? '', 'member');
	const id = await startRecipe(page, 'Session 4 (conflict test)');
	const other = await browser.newContext();
	await signInAs(other, baseURL ?? '', 'reviewer');
	const page2 = await other.newPage();
	await page2.goto(`/recipes/${id}/edit/roles`);
	await hydrated(page2);
	// The first editor saves; the second one, still on the old revision, saves too.
	await continueTo(page, 'Flux model');
	await page2.getByRole('button', { name: 'Save and continue to Flux model →' }).click();
	await expect(page2.getByRole('alert')).toContainText('Someone else saved this recipe after you opened it');
	await expect(page2.getByRole('link', { name: 'Reload the latest draft' })).toBeVisible();
	await other.close();
});
