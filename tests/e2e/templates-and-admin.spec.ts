import { test, expect, hydrated, query, seedSession, signInAs, teamId, PEOPLE } from './fixtures';
import AxeBuilder from '@axe-core/playwright';
import type { BrowserContext, Page } from '@playwright/test';
import { randomUUID } from 'node:crypto';

// Template editing, notification settings, failed notifications and the audit log, tried as
// a team lead, a member, a member of another team and the site admin would.

const ENTRY = 'python/calibrate.py.hbs';

async function expectNoSeriousA11yIssues(page: Page, label: string) {
	const results = await new AxeBuilder({ page }).analyze();
	const serious = results.violations.filter((v) => v.impact === 'serious' || v.impact === 'critical');
	expect(serious.map((v) => `${label}: ${v.id} (${v.nodes.length})`)).toEqual([]);
}

/** A template name no other test (or earlier run) used. */
function freshName(prefix: string): string {
	return `${prefix}-${randomUUID().slice(0, 8)}`;
}

/** The lead starts a team template on the Templates page; returns its id. */
async function startTemplate(page: Page, name: string): Promise<string> {
	await page.goto('/templates');
	await hydrated(page);
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByRole('button', { name: 'Start the template' }).click();
	await expect(page.getByRole('status')).toContainText(`Started the team template "${name}"`);
	const href = await page.getByRole('link', { name: `New version of ${name}` }).getAttribute('href');
	const m = /\/templates\/([0-9a-f-]{36})\/new-version$/.exec(href ?? '');
	if (!m?.[1]) throw new Error(`no template id in ${href}`);
	return m[1];
}

/** Opens the editor on the entry template, ready for typing. */
async function openEditor(page: Page, id: string, name: string): Promise<void> {
	await page.goto(`/templates/${id}/new-version`);
	await expect(page.getByRole('heading', { level: 1, name: `New version of ${name}` })).toBeVisible();
	await hydrated(page);
	await expect(page.locator('[data-testid="template-editor"][data-editor-ready="true"]')).toHaveCount(1);
	await expect(page.getByLabel('File to edit')).toHaveValue(ENTRY);
}

/** Types `text` as a new line 2 of the file open in the editor. */
async function insertSecondLine(page: Page, text: string): Promise<void> {
	await page.getByTestId('template-editor').locator('.cm-content').click();
	await page.keyboard.press('Control+Home');
	await page.keyboard.press('End');
	await page.keyboard.press('Enter');
	await page.keyboard.type(text);
}

async function versionCount(id: string): Promise<number> {
	const rows = await query<{ n: number }>('select count(*)::int as n from template_versions where template_id = $1', [id]);
	return rows[0]?.n ?? -1;
}

/**
 * Posts a form action the way the enhanced page does, as routes.spec.ts does: the answer is
 * 200 with { type: 'failure' | 'error', status } when the action refuses, so that status is returned.
 */
async function postAction(page: Page, url: string, form: Record<string, string>): Promise<{ status: number; text: string }> {
	// The app's own origin, or SvelteKit's CSRF check refuses the post (403) before the action runs.
	const origin = new URL(page.url()).origin;
	const res = await page.request.post(url, { form, maxRedirects: 0, headers: { origin, accept: 'application/json', 'x-sveltekit-action': 'true' } });
	const text = await res.text();
	if (res.status() !== 200) return { status: res.status(), text };
	const body = JSON.parse(text) as { type: string; status?: number };
	return { status: body.type === 'failure' || body.type === 'error' ? (body.status ?? 500) : 200, text };
}

function versionRows(page: Page, name: string) {
	return page.locator(`[data-testid="template-set"][data-template-name="${name}"]`).getByTestId('template-version-row');
}

test('a lead starts a team template, edits the entry file and saves a new version with a new SHA-256', async ({ page, context, baseURL }) => {
	test.setTimeout(60_000);
	await signInAs(context, baseURL ?? '', 'lead');
	const name = freshName('survey');
	const id = await startTemplate(page, name);

	// Version 1 is a copy of the starter set, so it has the same files and hash.
	const starterSha = await page.locator('[data-testid="template-set"][data-template-name="standard"]').getByTestId('template-sha256').first().getAttribute('data-sha256');
	await expect(versionRows(page, name)).toHaveCount(1);
	const v1Sha = await versionRows(page, name).first().getByTestId('template-sha256').getAttribute('data-sha256');
	expect(v1Sha).toBe(starterSha);

	await openEditor(page, id, name);
	await expectNoSeriousA11yIssues(page, 'template editor');
	await insertSecondLine(page, '# Checked by the survey lead before every season');
	await expect(page.getByTestId('changed-count')).toHaveText('1 file changed');
	await expect(page.getByLabel('File to edit').locator('option:checked')).toHaveText(`${ENTRY} (changed)`);
	await page.getByLabel('What changed in this version').fill('Note at the top of the program');
	await page.getByRole('button', { name: 'Save as version 2' }).click();

	const outcome = page.getByTestId('save-outcome');
	await expect(outcome).toContainText(`Saved version 2 of ${name}`);
	await expect(outcome).toContainText('rendered the demo recipe');
	// python3 is installed where the suite runs (the wizard test runs the program with it).
	await expect(outcome).toContainText("Python's parser accepted the rendered program");
	await expect(page.getByRole('button', { name: 'Save as version 3' })).toBeVisible();
	expect(await versionCount(id)).toBe(2);

	await page.goto('/templates');
	await expect(versionRows(page, name)).toHaveCount(2);
	const v2 = versionRows(page, name).first();
	await expect(v2).toContainText('Note at the top of the program');
	await expect(v2).toContainText(PEOPLE.lead);
	const v2Sha = await v2.getByTestId('template-sha256').getAttribute('data-sha256');
	expect(v2Sha).toMatch(/^[0-9a-f]{64}$/);
	expect(v2Sha).not.toBe(v1Sha);

	// The stored version holds the edit; it is shown read-only.
	await page.getByRole('link', { name: `${name} version 2` }).click();
	await expect(page.getByRole('heading', { level: 1, name: `${name} — version 2` })).toBeVisible();
	await expect(page.getByTestId('template-sha256')).toHaveText(v2Sha ?? '');
	await expect(page.getByTestId('template-file')).toContainText('# Checked by the survey lead before every season');
	await expect(page.getByTestId('template-file')).toContainText('read-only');
});

test('a broken edit is refused with the file and line, keeps the edit, and stores nothing', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'lead');
	const name = freshName('broken');
	const id = await startTemplate(page, name);
	await openEditor(page, id, name);
	await insertSecondLine(page, '{{{raw}}}');
	await page.getByLabel('What changed in this version').fill('Try raw output');
	await page.getByRole('button', { name: 'Save as version 2' }).click();

	const alert = page.getByTestId('save-error');
	await expect(alert).toContainText('Nothing was saved.');
	await expect(alert).toContainText(`templates/${ENTRY} line 2`);
	await expect(alert).toContainText('raw output');
	// The edit is still there to fix, and the changelog too.
	await expect(page.getByTestId('template-editor')).toContainText('{{{raw}}}');
	await expect(page.getByLabel('What changed in this version')).toHaveValue('Try raw output');
	expect(await versionCount(id)).toBe(1);

	await page.goto('/templates');
	await expect(versionRows(page, name)).toHaveCount(1);
});

test('without JavaScript each file is a textarea and the same form saves a version, with LF line ends kept', async ({ browser, baseURL }) => {
	const ctx = await browser.newContext({ javaScriptEnabled: false });
	await signInAs(ctx, baseURL ?? '', 'lead');
	const page = await ctx.newPage();
	const name = freshName('plain');
	await page.goto('/templates');
	await page.getByLabel('Name', { exact: true }).fill(name);
	await page.getByRole('button', { name: 'Start the template' }).click();
	await expect(page.getByRole('status')).toContainText(`Started the team template "${name}"`);
	await page.getByRole('link', { name: `New version of ${name}` }).click();
	await expect(page.getByRole('heading', { level: 1, name: `New version of ${name}` })).toBeVisible();
	await expect(page.getByTestId('template-editor')).toHaveCount(0);

	const entry = page.getByLabel(ENTRY, { exact: true });
	const text = await entry.inputValue();
	const firstBreak = text.indexOf('\n');
	await entry.fill(`${text.slice(0, firstBreak)}\n# Edited without JavaScript${text.slice(firstBreak)}`);
	await page.getByLabel('What changed in this version').fill('Edited in a plain form');
	await page.getByRole('button', { name: 'Save as version 2' }).click();
	await expect(page.getByTestId('save-outcome')).toContainText(`Saved version 2 of ${name}`);

	// Browsers post textarea line breaks as CRLF; the stored files must keep the LF of the starter set.
	const rows = await query<{ entry: string; n_cr: number }>(
		`select v.files ->> $2 as entry, (select count(*)::int from jsonb_each_text(v.files) f where position(chr(13) in f.value) > 0) as n_cr
		 from template_versions v join script_templates t on t.id = v.template_id where t.name = $1 and v.version = 2`,
		[name, ENTRY]
	);
	expect(rows[0]?.n_cr).toBe(0);
	expect(rows[0]?.entry.split('\n')[1]).toBe('# Edited without JavaScript');
	await ctx.close();
});

test('members cannot edit a team template and other teams cannot see it', async ({ page, context, baseURL, browser }) => {
	await signInAs(context, baseURL ?? '', 'lead');
	const name = freshName('private');
	const id = await startTemplate(page, name);

	const others: BrowserContext[] = [];
	const as = async (persona: 'member' | 'otherMember' | 'otherLead') => {
		const c = await browser.newContext();
		others.push(c);
		await signInAs(c, baseURL ?? '', persona);
		return c.newPage();
	};
	const member = await as('member');
	expect((await member.goto(`/templates/${id}/new-version`))?.status()).toBe(403);
	// A member of the team may read its template versions, without the edit link.
	expect((await member.goto(`/templates/${id}/versions/1`))?.status()).toBe(200);
	await expect(member.getByRole('link', { name: 'New version' })).toHaveCount(0);
	const posted = await postAction(member, `/templates/${id}/new-version?/saveVersion`, { baseVersion: '1', changelog: 'Not allowed', [`file:${ENTRY}`]: '# nothing' });
	expect(posted.status).toBe(403);
	expect(posted.text).toContain('Your role does not allow this');
	expect(await versionCount(id)).toBe(1);

	for (const persona of ['otherMember', 'otherLead'] as const) {
		const outsider = await as(persona);
		expect((await outsider.goto(`/templates/${id}/new-version`))?.status(), persona).toBe(404);
		expect((await outsider.goto(`/templates/${id}/versions/1`))?.status(), persona).toBe(404);
		await outsider.goto('/templates');
		await expect(outsider.locator(`[data-template-name="${name}"]`)).toHaveCount(0);
		await expect(outsider.locator('[data-template-name="standard"]')).toHaveCount(1);
	}
	for (const c of others) await c.close();
});

test('notification settings are saved, survive a reload, and bad input changes nothing', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherMember');
	const [user] = await query<{ id: string }>('select id from users where email = $1', [PEOPLE.otherMember]);
	const settings = async () => Object.fromEntries((await query<{ kind: string; enabled: boolean }>('select kind::text, enabled from notification_settings where user_id = $1', [user?.id])).map((r) => [r.kind, r.enabled]));

	await page.goto('/profile');
	await hydrated(page);
	const section = page.getByRole('region', { name: 'Notifications' });
	for (const label of ['Review requested', 'Decision made', 'Comment added', 'Fork of your shared recipe']) await expect(section.getByLabel(label)).toBeChecked();
	await section.getByLabel('Comment added').uncheck();
	await section.getByLabel('Fork of your shared recipe').uncheck();
	await section.getByRole('button', { name: 'Save notification settings' }).click();
	await expect(section.getByRole('status')).toHaveText('Saved: 2 kinds of e-mail turned off.');

	await page.reload();
	await hydrated(page);
	await expect(section.getByLabel('Comment added')).not.toBeChecked();
	await expect(section.getByLabel('Fork of your shared recipe')).not.toBeChecked();
	await expect(section.getByLabel('Review requested')).toBeChecked();
	await expect(section.getByLabel('Decision made')).toBeChecked();
	expect(await settings()).toEqual({ review_requested: true, review_decided: true, comment_added: false, recipe_forked: false });

	// A value no checkbox sends is refused before anything is written.
	const bad = await postAction(page, '/profile?/saveNotifications', { review_requested: 'on', comment_added: 'yes' });
	expect(bad.status).toBe(400);
	expect(bad.text).toContain('comment_added');
	expect(await settings()).toEqual({ review_requested: true, review_decided: true, comment_added: false, recipe_forked: false });

	// Back to every kind on, so other tests' e-mails still reach this person.
	await section.getByLabel('Comment added').check();
	await section.getByLabel('Fork of your shared recipe').check();
	await section.getByRole('button', { name: 'Save notification settings' }).click();
	await expect(section.getByRole('status')).toHaveText('Saved: you get every kind of e-mail.');
	await page.reload();
	await expect(section.getByLabel('Comment added')).toBeChecked();
});

test('the site admin sees failed notifications and queues one again; a member gets 403', async ({ page, context, baseURL, browser }) => {
	const [admin] = await query<{ id: string }>('select id from users where email = $1', [PEOPLE.admin]);
	const error = `Test row ${randomUUID().slice(0, 8)}: the mail server refused the message`;
	const [row] = await query<{ id: string }>(
		`insert into notifications (kind, recipient_id, link_path, payload, status, attempts, last_error, next_attempt_at)
		 values ('comment_added', $1, '/recipes', $2, 'failed', 5, $3, now()) returning id`,
		[admin?.id, JSON.stringify({ recipeTitle: 'Failed-mail test', version: 1, teamName: 'Stellar Nurseries Survey', actorName: 'Test' }), error]
	);

	await signInAs(context, baseURL ?? '', 'admin');
	await page.goto('/admin');
	await page.getByRole('link', { name: 'Failed notifications' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Failed notifications' })).toBeVisible();
	await hydrated(page);
	const entry = page.getByTestId('failed-notification').filter({ hasText: error });
	await expect(entry).toHaveCount(1);
	await expect(entry).toContainText('Comment added');
	await expect(entry).toContainText(PEOPLE.admin);
	await expect(entry.locator('td').nth(2)).toHaveText('5');

	// A made-up id is refused with a message; the row stays failed.
	const bogus = await postAction(page, '/admin/notifications?/retry', { id: 'not-an-id' });
	expect(bogus.status).toBe(400);
	expect(bogus.text).toContain('Queue again');
	expect((await query<{ status: string }>('select status::text from notifications where id = $1', [row?.id]))[0]?.status).toBe('failed');

	// A member may neither see the page nor queue the message again.
	const other = await browser.newContext();
	await signInAs(other, baseURL ?? '', 'member');
	const member = await other.newPage();
	expect((await member.goto('/admin/notifications'))?.status()).toBe(403);
	const refused = await postAction(member, '/admin/notifications?/retry', { id: row?.id ?? '' });
	expect(refused.status).toBe(403);
	expect(refused.text).toContain('Your role does not allow this');
	expect((await query<{ status: string }>('select status::text from notifications where id = $1', [row?.id]))[0]?.status).toBe('failed');
	await other.close();

	await entry.getByRole('button', { name: /^Queue again/ }).click();
	await expect(page.getByRole('status')).toContainText('queued again');
	await expect(page.getByTestId('failed-notification').filter({ hasText: error })).toHaveCount(0);
	const after = await query<{ status: string; attempts: number }>('select status::text, attempts from notifications where id = $1', [row?.id]);
	expect(['pending', 'sent']).toContain(after[0]?.status);
});

test('a lead reads the audit log from the team page; members, reviewers and the admin get 403, other teams 404', async ({ page, context, baseURL, browser }) => {
	await signInAs(context, baseURL ?? '', 'lead');
	const name = freshName('audited');
	await startTemplate(page, name);
	const team = await teamId('stellar-nurseries');

	await page.goto(`/teams/${team}`);
	await page.getByRole('navigation', { name: 'Team pages' }).getByRole('link', { name: 'Audit log' }).click();
	await expect(page.getByRole('heading', { level: 1, name: 'Audit log' })).toBeVisible();
	const newest = page.getByTestId('audit-entry').first();
	await expect(newest).toContainText('Started a team template');
	await expect(newest).toContainText(PEOPLE.lead);
	await expect(newest).toContainText('A copy of the starter set standard version');
	await newest.getByRole('link', { name: `Template ${name} version 1` }).click();
	await expect(page.getByRole('heading', { level: 1, name: `${name} — version 1` })).toBeVisible();

	const bad = await page.goto(`/teams/${team}/audit?before=abc`);
	expect(bad?.status()).toBe(400);
	await expect(page.getByText('The cursor is not one this list handed out')).toBeVisible();

	const expected = { member: 403, reviewer: 403, admin: 403, otherLead: 404 } as const;
	for (const [persona, status] of Object.entries(expected) as [keyof typeof expected, number][]) {
		const c = await browser.newContext();
		await signInAs(c, baseURL ?? '', persona);
		const p = await c.newPage();
		expect((await p.goto(`/teams/${team}/audit`))?.status(), persona).toBe(status);
		if (persona === 'member') {
			await p.goto(`/teams/${team}`);
			await expect(p.getByRole('link', { name: 'Audit log' })).toHaveCount(0);
		}
		await c.close();
	}
});

test('the audit log pages through older entries with its cursor', async ({ page, context, baseURL }) => {
	// A team of its own, so the filler entries do not crowd the demo team's log.
	const suffix = randomUUID().slice(0, 8);
	const email = `audit-lead-${suffix}@paging.example`;
	const [team] = await query<{ id: string }>('insert into teams (slug, name) values ($1, $2) returning id', [`paging-${suffix}`, `Paging ${suffix}`]);
	const [user] = await query<{ id: string }>('insert into users (email, name) values ($1, $2) returning id', [email, 'Paging Lead']);
	await query("insert into memberships (team_id, user_id, role) values ($1, $2, 'lead')", [team?.id, user?.id]);
	// 55 entries: one more page than the 50 a page shows.
	await query(
		`insert into audit_events (team_id, actor_id, action, subject_type, subject_id, details)
		 select $1, $2, 'recipe.share', 'recipe', gen_random_uuid()::text, jsonb_build_object('title', 'Paging recipe ' || n, 'latestVersion', n)
		 from generate_series(1, 55) as n order by n`,
		[team?.id, user?.id]
	);
	await context.addCookies([{ name: 'authjs.session-token', value: await seedSession(email), url: baseURL ?? '', httpOnly: true, sameSite: 'Lax' }]);

	await page.goto(`/teams/${team?.id}/audit`);
	const entries = page.getByTestId('audit-entry');
	await expect(entries).toHaveCount(50);
	await expect(entries.first()).toContainText('Recipe “Paging recipe 55”');
	await expect(entries.last()).toContainText('Recipe “Paging recipe 6”');
	await expect(page.getByRole('link', { name: 'Newest entries' })).toHaveCount(0);
	await page.getByRole('link', { name: 'Older entries' }).click();
	await expect(entries).toHaveCount(5);
	await expect(entries.first()).toContainText('Recipe “Paging recipe 5”');
	await expect(entries.last()).toContainText('Recipe “Paging recipe 1”');
	await expect(entries.last()).toContainText('Its newest version was then version 1.');
	await expect(page.getByRole('link', { name: 'Older entries' })).toHaveCount(0);
	await page.getByRole('link', { name: 'Newest entries' }).click();
	await expect(entries).toHaveCount(50);
});
