import { describe, expect, it } from 'vitest';
import { readFileSync, readdirSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { inRollback } from './db';
import { seedDemo } from '../../src/lib/server/services/seed';
import { uploadObservation } from '../../src/lib/server/services/observations';
import { getObservationBytes, listObservations } from '../../src/lib/server/db/queries/observations';
import { getTeamBySlug } from '../../src/lib/server/db/queries/teams';
import { observations } from '../../src/lib/server/db/schema';
import type { Executor } from '../../src/lib/server/db/client';

const FIXTURES = 'tests/fixtures/observations';

async function team(tx: Executor, slug = 'stellar-nurseries') {
	await seedDemo(tx);
	const t = await getTeamBySlug(tx, slug);
	if (!t) throw new Error('no team');
	return t;
}

describe('observation upload', () => {
	it('stores the exact bytes, their SHA-256 and the parsed summary', async () => {
		await inRollback(async (tx) => {
			const t = await team(tx, 'tidewater-transients');
			const bytes = readFileSync(`${FIXTURES}/demo.json`);
			const r = await uploadObservation(tx, { teamId: t.id, bytes, filename: 'demo.json', userId: null });
			expect(r.ok).toBe(true);
			if (!r.ok) return;
			// SHA-256 computed independently with Node's crypto (FIPS 180-4 implementation).
			expect(r.value.sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
			expect(Buffer.compare((await getObservationBytes(tx, r.value.id)) ?? Buffer.alloc(0), bytes)).toBe(0);
			const [row] = await listObservations(tx, t.id);
			expect(row?.summary.array.antennas).toHaveLength(28);
		});
	});

	it('refuses the same file twice in one team, and stores nothing the second time', async () => {
		await inRollback(async (tx) => {
			const t = await team(tx, 'tidewater-transients');
			const bytes = readFileSync(`${FIXTURES}/demo.json`);
			expect((await uploadObservation(tx, { teamId: t.id, bytes, filename: 'a.json', userId: null })).ok).toBe(true);
			const again = await uploadObservation(tx, { teamId: t.id, bytes, filename: 'b.json', userId: null });
			expect(again.ok ? null : again.error.code).toBe('conflict');
			expect(await listObservations(tx, t.id)).toHaveLength(1);
		});
	});

	const bad = readdirSync(FIXTURES).filter((f) => f !== 'demo.json' && f.endsWith('.json'));
	it('has a corpus of malformed summaries to try', () => {
		expect(bad.length).toBeGreaterThanOrEqual(5);
	});
	for (const file of bad) {
		it(`rejects ${file} with specific issues and stores nothing`, async () => {
			await inRollback(async (tx) => {
				const t = await team(tx);
				const before = (await tx.select().from(observations)).length;
				const r = await uploadObservation(tx, { teamId: t.id, bytes: readFileSync(`${FIXTURES}/${file}`), filename: file, userId: null });
				expect(r.ok).toBe(false);
				if (r.ok) return;
				expect(r.error.code).toBe('validation_failed');
				expect(r.error.issues?.length ?? 0).toBeGreaterThan(0);
				for (const issue of r.error.issues ?? []) expect(issue.path).toMatch(/^\$/);
				expect((await tx.select().from(observations)).length).toBe(before);
			});
		});
	}

	it('rejects bytes that are not UTF-8, and an empty file', async () => {
		await inRollback(async (tx) => {
			const t = await team(tx);
			const notText = await uploadObservation(tx, { teamId: t.id, bytes: new Uint8Array([0xff, 0xfe, 0x00, 0x41]), filename: 'x.json', userId: null });
			expect(notText.ok ? '' : notText.error.message).toMatch(/not UTF-8/);
			const empty = await uploadObservation(tx, { teamId: t.id, bytes: new Uint8Array(), filename: 'e.json', userId: null });
			expect(empty.ok ? '' : empty.error.message).toMatch(/empty/);
		});
	});

	it('rejects a file over the size limit before parsing it', async () => {
		await inRollback(async (tx) => {
			const t = await team(tx);
			const r = await uploadObservation(tx, { teamId: t.id, bytes: new Uint8Array(5_000_001).fill(0x20), filename: 'big.json', userId: null });
			expect(r.ok ? '' : r.error.message).toMatch(/limit is 5000000 bytes/);
		});
	});

	it('seeds the demo observation for the demo team exactly once', async () => {
		await inRollback(async (tx) => {
			const t = await team(tx);
			await seedDemo(tx);
			const rows = await listObservations(tx, t.id);
			expect(rows.map((o) => o.summary.array.name)).toEqual(['Corrie Flats Array']);
		});
	});
});
