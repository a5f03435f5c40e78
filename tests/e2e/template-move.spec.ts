import { test, expect, hydrated, query, signInAs, teamId } from './fixtures';

// A recipe moves to another template version only as a new recipe version, which can be
// diffed like any other (issue 6, point 4).
test('a lead moves a recipe to a team template: a new version with the same parameters', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'lead');
	const team = await teamId('stellar-nurseries');
	const name = `move-check-${Date.now()}`;
	await page.goto('/templates');
	await hydrated(page);
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByRole('button', { name: 'Start the template' }).click();
	await expect(page.locator(`[data-testid="template-set"][data-template-name="${name}"]`)).toBeVisible();

	const obs = await query<{ id: string }>("select id from observations where team_id = $1 and original_filename = 'corrie-flats-demo.json'", [team]);
	const origin = new URL(page.url()).origin;
	const created = await page.request.post(`/api/v1/teams/${team}/recipes`, { data: { observation_id: obs[0]?.id, title: 'Template move recipe' }, headers: { origin } });
	const { id } = (await created.json()) as { id: string };
	expect((await page.request.post(`/api/v1/recipes/${id}/versions`, { data: { message: 'First' }, headers: { origin } })).status()).toBe(201);

	await page.goto(`/recipes/${id}`);
	await hydrated(page);
	await expect(page.getByText('The newest version renders with')).toContainText('standard@');
	const option = page.getByLabel('Template version').locator('option', { hasText: `${name}@1` });
	await page.getByLabel('Template version').selectOption({ label: (await option.textContent()) ?? '' });
	await page.getByRole('button', { name: 'Save a new version with it' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(/— version 2$/);
	await expect(page.getByText(`rendered with template ${name}@1`)).toBeVisible();

	await page.goto(`/diff?from=${id}@1&to=${id}@2`);
	await expect(page.getByText('The parameters are the same.')).toBeVisible();
	await expect(page.getByTestId('text-stats')).not.toHaveText('identical');
	const versions = await query<{ version: number }>('select version from recipe_versions where recipe_id = $1 order by version', [id]);
	expect(versions.map((v) => v.version)).toEqual([1, 2]);
});
