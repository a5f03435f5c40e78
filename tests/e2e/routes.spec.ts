import { test, expect, seedSession, teamId, query, PEOPLE, type Persona } from './fixtures';
import { request as pwRequest, type APIRequestContext } from '@playwright/test';

// The route × role matrix over real HTTP against the built app: every route that exists,
// for anonymous visitors and each kind of person. Expected statuses follow DESIGN.md
// "Roles and permissions" (303 = page redirects to sign-in).
type Who = 'anonymous' | Exclude<Persona, 'otherMember'>;
const WHO: Who[] = ['anonymous', 'member', 'reviewer', 'lead', 'otherLead', 'admin'];

type Case = { name: string; method: 'GET' | 'POST'; path: (ids: Ids) => string; form?: Record<string, string>; json?: unknown; expect: Record<Who, number> };
type Ids = { own: string; other: string; observation: string };

const page = (signedIn: number) => ({ anonymous: 303, member: signedIn, reviewer: signedIn, lead: signedIn, otherLead: signedIn, admin: signedIn });

const CASES: Case[] = [
	{ name: 'dashboard', method: 'GET', path: () => '/', expect: page(200) },
	{ name: 'profile', method: 'GET', path: () => '/profile', expect: page(200) },
	{ name: 'recipes', method: 'GET', path: () => '/recipes', expect: page(200) },
	{ name: 'shared', method: 'GET', path: () => '/shared', expect: page(200) },
	// One team: straight to it (303); the admin has none and sees the list (200).
	{ name: 'team shortcut', method: 'GET', path: () => '/team', expect: { ...page(303), admin: 200 } },
	{ name: 'own team page', method: 'GET', path: (i) => `/teams/${i.own}`, expect: { anonymous: 303, member: 200, reviewer: 200, lead: 200, otherLead: 403, admin: 200 } },
	{
		name: 'add member action',
		method: 'POST',
		path: (i) => `/teams/${i.own}?/addMember`,
		form: { email: 'bad-address', role: 'member' },
		// Allowed people reach validation (400 for the bad address); others are stopped first.
		expect: { anonymous: 401, member: 403, reviewer: 403, lead: 400, otherLead: 403, admin: 400 }
	},
	{ name: 'team observations', method: 'GET', path: (i) => `/teams/${i.own}/observations`, expect: { anonymous: 303, member: 200, reviewer: 200, lead: 200, otherLead: 404, admin: 403 } },
	{ name: 'observation page', method: 'GET', path: (i) => `/observations/${i.observation}`, expect: { anonymous: 303, member: 200, reviewer: 200, lead: 200, otherLead: 404, admin: 404 } },
	{ name: 'team rule policy', method: 'GET', path: (i) => `/teams/${i.own}/rules`, expect: { anonymous: 303, member: 200, reviewer: 200, lead: 200, otherLead: 403, admin: 200 } },
	{
		name: 'save rule policy action',
		method: 'POST',
		path: (i) => `/teams/${i.own}/rules?/savePolicy`,
		form: { 'rule:no.such_rule': 'off' },
		expect: { anonymous: 401, member: 403, reviewer: 403, lead: 400, otherLead: 403, admin: 403 }
	},
	{ name: 'API observations list', method: 'GET', path: (i) => `/api/v1/teams/${i.own}/observations`, expect: { anonymous: 401, member: 200, reviewer: 200, lead: 200, otherLead: 404, admin: 403 } },
	{ name: 'API observation upload (empty)', method: 'POST', path: (i) => `/api/v1/teams/${i.own}/observations`, json: {}, expect: { anonymous: 401, member: 400, reviewer: 400, lead: 400, otherLead: 404, admin: 403 } },
	{ name: 'API validate (bad recipe)', method: 'POST', path: () => '/api/v1/validate', json: { recipe: {} }, expect: { anonymous: 401, member: 400, reviewer: 400, lead: 400, otherLead: 400, admin: 400 } },
	{ name: 'API render (bad recipe)', method: 'POST', path: () => '/api/v1/render', json: { recipe: {} }, expect: { anonymous: 401, member: 400, reviewer: 400, lead: 400, otherLead: 400, admin: 400 } },
	{ name: 'API create recipe (bad body)', method: 'POST', path: (i) => `/api/v1/teams/${i.own}/recipes`, json: {}, expect: { anonymous: 401, member: 400, reviewer: 400, lead: 400, otherLead: 404, admin: 403 } },
	{ name: 'templates page', method: 'GET', path: () => '/templates', expect: page(200) },
	{ name: 'team audit log', method: 'GET', path: (i) => `/teams/${i.own}/audit`, expect: { anonymous: 303, member: 403, reviewer: 403, lead: 200, otherLead: 404, admin: 403 } },
	{ name: 'failed notifications (admin)', method: 'GET', path: () => '/admin/notifications', expect: { anonymous: 303, member: 403, reviewer: 403, lead: 403, otherLead: 403, admin: 200 } },
	{ name: 'review queue', method: 'GET', path: () => '/reviews', expect: page(200) },
	{ name: 'new recipe', method: 'GET', path: () => '/recipes/new', expect: page(200) },
	{ name: 'API recipes list', method: 'GET', path: () => '/api/v1/recipes', expect: { anonymous: 401, member: 200, reviewer: 200, lead: 200, otherLead: 200, admin: 200 } },
	{ name: 'API shared list', method: 'GET', path: () => '/api/v1/shared', expect: { anonymous: 401, member: 200, reviewer: 200, lead: 200, otherLead: 200, admin: 200 } },
	{ name: 'diff with a bad link', method: 'GET', path: () => '/diff?from=x&to=y', expect: { anonymous: 303, member: 400, reviewer: 400, lead: 400, otherLead: 400, admin: 400 } },
	{ name: 'admin page', method: 'GET', path: () => '/admin', expect: { anonymous: 303, member: 403, reviewer: 403, lead: 403, otherLead: 403, admin: 200 } },
	{ name: 'API me', method: 'GET', path: () => '/api/v1/me', expect: { anonymous: 401, member: 200, reviewer: 200, lead: 200, otherLead: 200, admin: 200 } },
	{ name: 'API team members', method: 'GET', path: (i) => `/api/v1/teams/${i.own}/members`, expect: { anonymous: 401, member: 200, reviewer: 200, lead: 200, otherLead: 404, admin: 200 } },
	{
		name: 'API add member (invalid body)',
		method: 'POST',
		path: (i) => `/api/v1/teams/${i.own}/members`,
		json: { email: 'not-an-address' },
		expect: { anonymous: 401, member: 403, reviewer: 403, lead: 400, otherLead: 404, admin: 400 }
	},
	{ name: 'health check', method: 'GET', path: () => '/healthz', expect: { anonymous: 200, member: 200, reviewer: 200, lead: 200, otherLead: 200, admin: 200 } },
	{ name: 'dev mailbox', method: 'GET', path: () => '/dev/mailbox', expect: { anonymous: 200, member: 200, reviewer: 200, lead: 200, otherLead: 200, admin: 200 } },
	{ name: 'sign-in page', method: 'GET', path: () => '/signin', expect: { anonymous: 200, member: 303, reviewer: 303, lead: 303, otherLead: 303, admin: 303 } },
	{ name: 'unknown page', method: 'GET', path: () => '/no-such-page', expect: { anonymous: 404, member: 404, reviewer: 404, lead: 404, otherLead: 404, admin: 404 } }
];

const contexts = new Map<Who, APIRequestContext>();
let ids: Ids;

test.beforeAll(async ({ baseURL }) => {
	const obs = await query<{ id: string }>("select id from observations where original_filename = 'corrie-flats-demo.json' limit 1");
	ids = { own: await teamId('stellar-nurseries'), other: await teamId('tidewater-transients'), observation: obs[0]?.id ?? '' };
	for (const who of WHO) {
		const headers: Record<string, string> = { origin: baseURL ?? '' };
		if (who !== 'anonymous') headers.cookie = `authjs.session-token=${await seedSession(PEOPLE[who])}`;
		contexts.set(who, await pwRequest.newContext({ baseURL, extraHTTPHeaders: headers }));
	}
});

test.afterAll(async () => {
	for (const c of contexts.values()) await c.dispose();
});

for (const c of CASES) {
	test(`route matrix: ${c.method} ${c.name}`, async () => {
		const got: Record<string, number> = {};
		for (const who of WHO) {
			const ctx = contexts.get(who);
			if (!ctx) throw new Error('missing context');
			const url = c.path(ids);
			const res =
				c.method === 'GET'
					? await ctx.get(url, { maxRedirects: 0 })
					: c.form
						? await ctx.post(url, { form: c.form, maxRedirects: 0, headers: { accept: 'application/json', 'x-sveltekit-action': 'true' } })
						: await ctx.post(url, { data: c.json, maxRedirects: 0 });
			// Form actions called with the JS header answer 200 with { type: 'failure', status }.
			let status = res.status();
			if (c.form && status === 200) {
				const body = (await res.json()) as { type: string; status?: number };
				if (body.type === 'failure' || body.type === 'error') status = body.status ?? 500;
			}
			got[who] = status;
		}
		expect(got).toEqual(c.expect);
	});
}

test('API errors share one JSON shape', async () => {
	const lead = contexts.get('lead');
	if (!lead) throw new Error('missing context');
	const bad = await lead.post(`/api/v1/teams/${ids.own}/members`, { data: { email: 'nope' } });
	expect(bad.status()).toBe(400);
	const body = (await bad.json()) as { error: { code: string; message: string; issues: { path: string; message: string }[] } };
	expect(body.error.code).toBe('validation_failed');
	expect(body.error.issues[0]?.path).toBe('$.email');
	const malformed = await lead.post(`/api/v1/teams/${ids.own}/members`, { headers: { 'content-type': 'application/json' }, data: Buffer.from('{"email": ') });
	expect(malformed.status()).toBe(400);
	expect(((await malformed.json()) as { error: { message: string } }).error.message).toMatch(/not valid JSON/);
	const anon = await contexts.get('anonymous')?.get('/api/v1/me');
	expect(await anon?.json()).toEqual({ error: { code: 'unauthenticated', message: 'Sign in to continue.' } });
});

test('health check reports the database', async () => {
	const res = await contexts.get('anonymous')?.get('/healthz');
	expect(await res?.json()).toMatchObject({ status: 'ok', database: 'ok' });
});
