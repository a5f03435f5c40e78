import { and, eq } from 'drizzle-orm';
import type { Executor } from '../db/client';
import { memberships, users } from '../db/schema';
import { getTeamBySlug, insertMembership, insertTeam } from '../db/queries/teams';
import { upsertUserByEmail } from '../db/queries/users';
import type { TeamRole } from '$lib/workflow/permissions';
import { createDemoObservation } from '$lib/calibration/demo-observation';
import { uploadObservation } from './observations';

// The invented demo scenario (DESIGN.md "Demo scenario"): people and teams are fictional.
export const DEMO_ADMIN = { email: 'admin@phasewright.example', name: 'Site Admin' };
export const DEMO_TEAMS: { slug: string; name: string; people: { email: string; name: string; role: TeamRole }[] }[] = [
	{
		slug: 'stellar-nurseries',
		name: 'Stellar Nurseries Survey',
		people: [
			{ email: 'ada@stellar-nurseries.example', name: 'Ada Okafor', role: 'member' },
			{ email: 'ravi@stellar-nurseries.example', name: 'Ravi Menon', role: 'reviewer' },
			{ email: 'lena@stellar-nurseries.example', name: 'Lena Fischer', role: 'lead' }
		]
	},
	{
		slug: 'tidewater-transients',
		name: 'Tidewater Transients',
		people: [
			{ email: 'tomas@tidewater.example', name: 'Tomás Reyes', role: 'lead' },
			{ email: 'ines@tidewater.example', name: 'Inès Moreau', role: 'member' }
		]
	}
];

/** Inserts the demo people and teams when missing; running it again changes nothing. */
export async function seedDemo(db: Executor): Promise<{ created: number }> {
	return db.transaction(async (tx) => {
		let created = 0;
		const admin = await upsertUserByEmail(tx, DEMO_ADMIN.email, DEMO_ADMIN.name);
		if (!admin.isAdmin) {
			await tx.update(users).set({ isAdmin: true }).where(eq(users.id, admin.id));
			created++;
		}
		for (const t of DEMO_TEAMS) {
			let team = await getTeamBySlug(tx, t.slug);
			if (!team) {
				team = await insertTeam(tx, { slug: t.slug, name: t.name });
				created++;
			}
			for (const p of t.people) {
				const user = await upsertUserByEmail(tx, p.email, p.name);
				const existing = await tx
					.select({ role: memberships.role })
					.from(memberships)
					.where(and(eq(memberships.teamId, team.id), eq(memberships.userId, user.id)));
				if (existing.length === 0) {
					await insertMembership(tx, { teamId: team.id, userId: user.id, role: p.role });
					created++;
				}
			}
		}
		// The demo observation, as if Ada had uploaded it (same bytes every time: idempotent).
		const demoTeam = await getTeamBySlug(tx, DEMO_TEAMS[0]?.slug ?? '');
		const ada = await upsertUserByEmail(tx, 'ada@stellar-nurseries.example', 'Ada Okafor');
		if (demoTeam) {
			const bytes = new TextEncoder().encode(`${JSON.stringify(createDemoObservation(), null, 2)}\n`);
			const r = await uploadObservation(tx, { teamId: demoTeam.id, bytes, filename: 'corrie-flats-demo.json', userId: ada.id });
			if (r.ok) created++;
			else if (r.error.code !== 'conflict') throw new Error(`demo observation rejected: ${r.error.message}`);
		}
		return { created };
	});
}
