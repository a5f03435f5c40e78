import { describe, expect, it } from 'vitest';
import { isHttpError } from '@sveltejs/kit';
import { inRollback } from './db';
import { seedDemo } from '../../src/lib/server/services/seed';
import { getSessionUser, findUserByEmail } from '../../src/lib/server/db/queries/users';
import { getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import { sessions } from '../../src/lib/server/db/schema';
import { requireCan, requireUser } from '../../src/lib/server/guards';
import type { Executor } from '../../src/lib/server/db/client';
import type { Action } from '../../src/lib/workflow/permissions';

const NOW = new Date('2026-12-01T12:00:00Z');

async function sessionFor(tx: Executor, email: string, expires = new Date(NOW.getTime() + 3600_000)) {
	const user = await findUserByEmail(tx, email);
	if (!user) throw new Error(`no user ${email}`);
	const token = `test-${email}-${expires.getTime()}`;
	await tx.insert(sessions).values({ sessionToken: token, userId: user.id, expires });
	return getSessionUser(tx, token, NOW);
}

/** The HTTP status the guard produces (200 when allowed). */
function statusOf(fn: () => unknown): number {
	try {
		fn();
		return 200;
	} catch (e) {
		if (isHttpError(e)) return e.status;
		throw e;
	}
}

describe('sessions from the database', () => {
	it('loads the signed-in user with their team roles', async () => {
		await inRollback(async (tx) => {
			await seedDemo(tx);
			const lena = await sessionFor(tx, 'lena@stellar-nurseries.example');
			expect(lena?.memberships.map((m) => [m.teamName, m.role])).toEqual([['Stellar Nurseries Survey', 'lead']]);
		});
	});

	it('treats an expired session as signed out', async () => {
		await inRollback(async (tx) => {
			await seedDemo(tx);
			const expired = await sessionFor(tx, 'ada@stellar-nurseries.example', new Date(NOW.getTime() - 1000));
			expect(expired).toBeNull();
			expect(statusOf(() => requireUser({ locals: { user: expired } }))).toBe(401);
		});
	});
});

describe('guards over real memberships (role × action × own team / other team / anonymous)', () => {
	// Expected statuses from DESIGN.md "Roles and permissions": 200 allowed, 401 signed out,
	// 403 visible but role too low, 404 another team's private resource (not revealed).
	const cases: { who: string | null; action: Action; team: 'own' | 'other'; status: number }[] = [
		{ who: null, action: 'team.view', team: 'own', status: 401 },
		{ who: 'ada@stellar-nurseries.example', action: 'team.view', team: 'own', status: 200 },
		{ who: 'ada@stellar-nurseries.example', action: 'team.manage_members', team: 'own', status: 403 },
		{ who: 'ada@stellar-nurseries.example', action: 'review.decide', team: 'own', status: 403 },
		{ who: 'ravi@stellar-nurseries.example', action: 'review.decide', team: 'own', status: 200 },
		{ who: 'ravi@stellar-nurseries.example', action: 'team.manage_members', team: 'own', status: 403 },
		{ who: 'lena@stellar-nurseries.example', action: 'team.manage_members', team: 'own', status: 200 },
		{ who: 'lena@stellar-nurseries.example', action: 'recipe.share', team: 'own', status: 200 },
		{ who: 'lena@stellar-nurseries.example', action: 'team.view', team: 'other', status: 404 },
		{ who: 'lena@stellar-nurseries.example', action: 'recipe.edit', team: 'other', status: 404 },
		{ who: 'tomas@tidewater.example', action: 'team.manage_members', team: 'other', status: 404 },
		{ who: 'admin@phasewright.example', action: 'team.manage_members', team: 'own', status: 200 },
		{ who: 'admin@phasewright.example', action: 'recipe.edit', team: 'own', status: 403 }
	];
	for (const c of cases) {
		it(`${c.who ?? 'anonymous'} → ${c.action} on ${c.team} team: ${c.status}`, async () => {
			await inRollback(async (tx) => {
				await seedDemo(tx);
				const own = await getTeamBySlug(tx, 'stellar-nurseries');
				const other = await getTeamBySlug(tx, 'tidewater-transients');
				if (!own || !other) throw new Error('seed teams missing');
				const user = c.who ? await sessionFor(tx, c.who) : null;
				// "own" is always the Stellar Nurseries team; Tomás (Tidewater) sees it as another team.
				const teamId = c.team === 'own' ? own.id : c.who === 'tomas@tidewater.example' ? own.id : other.id;
				expect(statusOf(() => requireCan({ locals: { user } }, c.action, { teamId }, 'team.view'))).toBe(c.status);
			});
		});
	}
});
