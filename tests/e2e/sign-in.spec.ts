import { test, expect, hydrated, query, signInAs, teamId } from './fixtures';
import type { Page } from '@playwright/test';

/** Opens the newest mailbox message for `email` and returns the sign-in link in it. */
async function linkFromMailbox(page: Page, email: string): Promise<string> {
	await page.goto('/dev/mailbox');
	await page.getByRole('row', { name: new RegExp(email.replace(/[.@]/g, '\\$&')) }).first().getByRole('link').click();
	const link = page.getByTestId('mail-link').first();
	await expect(link).toBeVisible();
	const href = await link.getAttribute('href');
	if (!href) throw new Error('no link in the message');
	return href;
}

test('a new user signs in with the e-mail link, lands on the dashboard and signs out', async ({ page }) => {
	await page.goto('/');
	await expect(page).toHaveURL(/\/signin/);
	await hydrated(page);
	await page.getByLabel('E-mail address').fill('ada@stellar-nurseries.example');
	await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
	await expect(page.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();

	const link = await linkFromMailbox(page, 'ada@stellar-nurseries.example');
	await page.goto(link);
	await expect(page.getByRole('heading', { name: 'Welcome, Ada Okafor' })).toBeVisible();
	await expect(page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Recipes' })).toBeVisible();

	// A sign-in link works once.
	await page.goto(link);
	await expect(page.getByRole('heading', { name: 'This sign-in link no longer works' })).toBeVisible();

	await page.goto('/');
	await page.getByRole('button', { name: 'Sign out' }).click();
	await expect(page).toHaveURL(/\/signin/);
	await page.goto('/profile');
	await expect(page).toHaveURL(/\/signin\?redirectTo=%2Fprofile/);
});

test('an unknown address gets a clear message and no e-mail is sent', async ({ page }) => {
	const before = await query<{ n: string }>('select count(*)::text as n from mail_messages');
	await page.goto('/signin');
	await hydrated(page);
	await page.getByLabel('E-mail address').fill('stranger@nowhere.example');
	await page.getByRole('button', { name: 'Send me a sign-in link' }).click();
	await expect(page.getByRole('alert')).toContainText('No Phasewright account uses stranger@nowhere.example');
	const after = await query<{ n: string }>('select count(*)::text as n from mail_messages');
	expect(after[0]?.n).toBe(before[0]?.n);
});

test('a lead adds a member, who then signs in and sees the team', async ({ page, context, baseURL, browser }) => {
	await signInAs(context, baseURL ?? '', 'lead');
	const id = await teamId('stellar-nurseries');
	await page.goto(`/teams/${id}`);
	await hydrated(page);
	await page.getByLabel('E-mail', { exact: true }).fill('noor@stellar-nurseries.example');
	await page.getByLabel('Name').fill('Noor Haddad');
	await page.getByLabel('Role', { exact: true }).selectOption('member');
	await page.getByRole('button', { name: 'Add member' }).click();
	await expect(page.getByRole('status')).toContainText('noor@stellar-nurseries.example is now a member');
	await expect(page.getByTestId('members')).toContainText('noor@stellar-nurseries.example');

	// The new member, in a browser of their own.
	const theirs = await browser.newContext();
	const p2 = await theirs.newPage();
	await p2.goto('/signin');
	await hydrated(p2);
	await p2.getByLabel('E-mail address').fill('noor@stellar-nurseries.example');
	await p2.getByRole('button', { name: 'Send me a sign-in link' }).click();
	await expect(p2.getByRole('heading', { name: 'Check your e-mail' })).toBeVisible();
	const link = await linkFromMailbox(p2, 'noor@stellar-nurseries.example');
	await p2.goto(link);
	await expect(p2.getByRole('heading', { name: 'Welcome, Noor Haddad' })).toBeVisible();
	await p2.goto('/profile');
	await expect(p2.getByTestId('profile-teams')).toContainText('Stellar Nurseries Survey');
	await expect(p2.getByTestId('profile-teams')).toContainText('member');
	await theirs.close();
});

test('the last lead cannot be demoted', async ({ page, context, baseURL }) => {
	await signInAs(context, baseURL ?? '', 'otherLead');
	const id = await teamId('tidewater-transients');
	await page.goto(`/teams/${id}`);
	await hydrated(page);
	await page.getByLabel('Role of tomas@tidewater.example').selectOption('member');
	await page.getByRole('row', { name: /tomas@tidewater.example/ }).getByRole('button', { name: 'Change role' }).click();
	await expect(page.getByRole('alert')).toContainText('A team needs at least one lead');
});
