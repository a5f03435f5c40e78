import { test, expect, hydrated, query, seedSession, signInAs, teamId, PEOPLE } from './fixtures';
import { request as pwRequest, type Page } from '@playwright/test';

// Review, diff, share and fork tried as the people who do them: a reviewer, the author,
// a lead, and a member of another team. Versions are set up through the API as a script would.

async function setUpRecipe(baseURL: string): Promise<string> {
	const team = await teamId('stellar-nurseries');
	const obs = await query<{ id: string }>("select id from observations where team_id = $1 and original_filename = 'corrie-flats-demo.json'", [team]);
	const ada = await pwRequest.newContext({ baseURL, extraHTTPHeaders: { cookie: `authjs.session-token=${await seedSession(PEOPLE.member)}` } });
	const created = await ada.post(`/api/v1/teams/${team}/recipes`, { data: { observation_id: obs[0]?.id, title: 'Review flow recipe' } });
	const { id } = (await created.json()) as { id: string };
	expect((await ada.post(`/api/v1/recipes/${id}/versions`, { data: { message: 'First plan' } })).status()).toBe(201);
	const draft = await query<{ draft: { steps: { kind: string; interval?: unknown }[] } }>('select draft from recipes where id = $1', [id]);
	const params = draft[0]?.draft;
	if (!params) throw new Error('no draft');
	const gain = params.steps.find((s) => s.kind === 'gain');
	if (gain) gain.interval = { mode: 'seconds', seconds: 60 };
	expect((await ada.post(`/api/v1/recipes/${id}/versions`, { data: { message: 'Gains per minute', params } })).status()).toBe(201);
	await ada.dispose();
	return id;
}

async function mailTo(page: Page, email: string, subject: RegExp): Promise<void> {
	await expect(async () => {
		await page.goto('/dev/mailbox');
		await expect(page.getByRole('row', { name: new RegExp(email.replace(/[.@]/g, '\\$&')) }).filter({ hasText: subject }).first()).toBeVisible({ timeout: 1000 });
	}).toPass({ timeout: 15_000 });
}

test('review, diff, changes requested, resubmission, approval, share, fork and compare with upstream', async ({ page, context, baseURL, browser }) => {
	test.setTimeout(120_000);
	const id = await setUpRecipe(baseURL ?? '');

	// The author submits v2 for review.
	await signInAs(context, baseURL ?? '', 'member');
	await page.goto(`/recipes/${id}/versions/2`);
	await hydrated(page);
	await page.getByRole('button', { name: 'Submit for review' }).click();
	await expect(page.getByTestId('review-state')).toHaveText('In review');

	// The reviewer: queue, diff v1 → v2, a comment on a program line, changes requested.
	const rc = await browser.newContext();
	await signInAs(rc, baseURL ?? '', 'reviewer');
	const rv = await rc.newPage();
	await mailTo(rv, PEOPLE.reviewer, /Review requested: Review flow recipe v2/);
	await rv.goto('/reviews');
	await rv.getByTestId('review-queue').getByRole('link', { name: 'Review flow recipe v2' }).click();
	await hydrated(rv);
	await rv.getByRole('link', { name: '← Review flow recipe' }).click();
	await hydrated(rv);
	await rv.getByLabel('Compare from v1').check();
	await rv.getByLabel('Compare to v2').check();
	await rv.getByRole('button', { name: 'Compare the chosen versions' }).click();
	await expect(rv.getByTestId('param-changes')).toContainText('Gain solve interval: per scan → 60 s');
	await expect(rv.getByTestId('hunk').first()).toBeVisible();
	await rv.getByRole('link', { name: 'Side by side' }).click();
	await expect(rv).toHaveURL(/view=split/);
	await rv.goto(`/recipes/${id}/versions/2`);
	await hydrated(rv);
	await rv.getByLabel('Comment', { exact: true }).fill('One minute is short for the gain calibrator; keep per scan.');
	await rv.getByLabel(/On program line/).fill('30');
	await rv.getByRole('button', { name: 'Add comment' }).click();
	await expect(rv.getByTestId('review-timeline')).toContainText('commented on line 30');
	await rv.getByLabel('Note with your decision (optional)').fill('See my comment.');
	await rv.getByRole('button', { name: 'Request changes' }).click();
	await expect(rv.getByTestId('review-state')).toHaveText('Changes requested');

	// The author reads the e-mail, saves v3 and resubmits it.
	await mailTo(page, PEOPLE.member, /Changes requested: Review flow recipe v2/);
	await page.goto(`/recipes/${id}/edit/solve`);
	await hydrated(page);
	await page.getByRole('group', { name: /Complex gains/ }).getByLabel('Solution interval', { exact: true }).selectOption('scan');
	await page.getByRole('button', { name: 'Save and continue to Review →' }).click();
	await hydrated(page);
	await page.getByLabel('What this version changes').fill('Gains per scan again, as asked');
	await page.getByRole('button', { name: 'Save version' }).click();
	await expect(page.getByRole('heading', { level: 1 })).toHaveText(/— version 3$/);
	await hydrated(page);
	await page.getByRole('button', { name: 'Submit for review' }).click();
	await expect(page.getByTestId('review-state')).toHaveText('In review');

	// The reviewer approves v3; the author may not approve their own work.
	await expect(page.getByRole('button', { name: 'Approve' })).toHaveCount(0);
	await rv.goto(`/recipes/${id}/versions/3`);
	await hydrated(rv);
	await rv.getByRole('button', { name: 'Approve' }).click();
	await expect(rv.getByTestId('review-state')).toHaveText('Approved');
	await expect(rv.getByTestId('review-timeline')).toContainText('approved it');
	await rc.close();

	// The lead shares the recipe with all teams.
	const lc = await browser.newContext();
	await signInAs(lc, baseURL ?? '', 'lead');
	const lp = await lc.newPage();
	await lp.goto(`/recipes/${id}`);
	await hydrated(lp);
	await lp.getByRole('button', { name: 'Share with all teams' }).click();
	await expect(lp.getByRole('status')).toContainText('Shared with all teams');
	await lc.close();

	// A member of another team finds it, forks the approved version, changes it and compares.
	const oc = await browser.newContext();
	await signInAs(oc, baseURL ?? '', 'otherMember');
	const op = await oc.newPage();
	await op.goto('/shared');
	await hydrated(op);
	await op.getByLabel('Approved versions only').check();
	await op.getByRole('button', { name: 'Filter' }).click();
	await op.getByTestId('shared-table').getByRole('link', { name: 'Review flow recipe' }).click();
	await hydrated(op);
	await op.getByLabel('Version', { exact: true }).selectOption('3');
	await op.getByRole('button', { name: 'Fork' }).click();
	await expect(op.getByTestId('lineage')).toContainText('forked from Review flow recipe v3');
	const forkUrl = op.url();
	await op.goto(`${forkUrl}/edit/solve`);
	await hydrated(op);
	await op.getByRole('group', { name: /Complex gains/ }).getByLabel('Solution interval', { exact: true }).selectOption('integration');
	await op.getByRole('button', { name: 'Save and continue to Review →' }).click();
	await hydrated(op);
	await op.getByLabel('What this version changes').fill('Per integration for our brighter calibrator');
	await op.getByRole('button', { name: 'Save version' }).click();
	await expect(op.getByRole('heading', { level: 1 })).toHaveText(/— version 2$/);
	await op.goto(forkUrl);
	await op.getByRole('link', { name: /Compare with upstream/ }).click();
	await expect(op.getByTestId('param-changes')).toContainText('Gain solve interval: per scan → per integration');
	await oc.close();

	// The source team's leads hear of the fork.
	const mc = await browser.newContext();
	const mp = await mc.newPage();
	await mailTo(mp, PEOPLE.lead, /Forked: Review flow recipe v3/);
	await mc.close();
});
