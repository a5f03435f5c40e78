import { test, expect, hydrated, query, signInAs, teamId } from './fixtures';

test('a member uploads an observation summary and sees its fields, scans and antennas', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherMember');
	const id = await teamId('tidewater-transients');
	await page.goto(`/teams/${id}/observations`);
	await hydrated(page);
	await page.getByLabel('Summary file (.json, at most 5 MB)').setInputFiles('tests/fixtures/observations/demo.json');
	await page.getByRole('button', { name: 'Upload' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText('Stellar Nurseries Survey, session 1 (demo)');
	await expect(page.getByText('Corrie Flats Array · 28 antennas')).toBeVisible();
	await expect(page.getByRole('heading', { name: /^Scans \(\d+\)$/ })).toBeVisible();
	await expect(page.getByRole('cell', { name: 'CFA-GCAL-1' }).first()).toBeVisible();
});

test('a bad upload lists its problems and stores nothing', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherMember');
	const id = await teamId('tidewater-transients');
	const before = await query<{ n: string }>('select count(*)::text as n from observations');
	await page.goto(`/teams/${id}/observations`);
	await hydrated(page);
	await page.getByLabel('Summary file (.json, at most 5 MB)').setInputFiles('tests/fixtures/observations/missing-references.json');
	await page.getByRole('button', { name: 'Upload' }).click();
	await expect(page.getByRole('alert')).toContainText('is not a valid phasewright.observation v1 summary');
	await expect(page.getByTestId('upload-issues').getByRole('listitem').first()).toContainText('$.');
	const after = await query<{ n: string }>('select count(*)::text as n from observations');
	expect(after[0]?.n).toBe(before[0]?.n);
});

test('the rule policy page lets the lead change a rule and shows it to members', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherLead');
	const id = await teamId('tidewater-transients');
	await page.goto(`/teams/${id}/rules`);
	await hydrated(page);
	await page.getByLabel('Severity of prep.interval_shorter_than_scan for this team').selectOption('warning');
	await page.getByRole('button', { name: 'Save the policy' }).click();
	await expect(page.getByRole('status')).toContainText('1 rule changed');
	const rows = await query<{ p: { overrides: Record<string, string> } }>('select rule_policy as p from teams where id = $1', [id]);
	expect(rows[0]?.p.overrides).toEqual({ 'prep.interval_shorter_than_scan': 'warning' });
});
