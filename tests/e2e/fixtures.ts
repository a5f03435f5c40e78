import { test as base, expect, type Page, type BrowserContext } from '@playwright/test';
import pg from 'pg';
import { randomUUID } from 'node:crypto';

// Signed-in sessions are seeded straight into the database (STYLE.md §6): only one test
// goes through the e-mail link. The e2e database was migrated and seeded by npm test.
export const PEOPLE = {
	member: 'ada@stellar-nurseries.example',
	reviewer: 'ravi@stellar-nurseries.example',
	lead: 'lena@stellar-nurseries.example',
	otherLead: 'tomas@tidewater.example',
	otherMember: 'ines@tidewater.example',
	admin: 'admin@phasewright.example'
} as const;
export type Persona = keyof typeof PEOPLE;

export async function query<T extends pg.QueryResultRow>(sql: string, params: unknown[] = []): Promise<T[]> {
	const client = new pg.Client({ connectionString: process.env.DATABASE_URL });
	await client.connect();
	try {
		return (await client.query<T>(sql, params)).rows;
	} finally {
		await client.end();
	}
}

/** Creates a database session for the person and returns its cookie value. */
export async function seedSession(email: string): Promise<string> {
	const token = randomUUID();
	const rows = await query<{ id: string }>('select id from users where email = $1', [email]);
	const user = rows[0];
	if (!user) throw new Error(`no seeded user ${email}`);
	await query("insert into sessions (session_token, user_id, expires) values ($1, $2, now() + interval '1 day')", [token, user.id]);
	return token;
}

export async function signInAs(context: BrowserContext, baseURL: string, persona: Persona): Promise<void> {
	const token = await seedSession(PEOPLE[persona]);
	await context.addCookies([{ name: 'authjs.session-token', value: token, url: baseURL, httpOnly: true, sameSite: 'Lax' }]);
}

export async function teamId(slug: string): Promise<string> {
	const rows = await query<{ id: string }>('select id from teams where slug = $1', [slug]);
	if (!rows[0]) throw new Error(`no team ${slug}`);
	return rows[0].id;
}

/** Waits until the page has hydrated (the root layout sets the marker in onMount). */
export async function hydrated(page: Page): Promise<void> {
	await expect(page.locator('html[data-hydrated="true"]')).toHaveCount(1);
}

export const test = base;
export { expect };
