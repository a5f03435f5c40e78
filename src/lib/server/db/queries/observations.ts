import { and, desc, eq } from 'drizzle-orm';
import type { Executor } from '../client';
import { observations, users } from '../schema';
import type { ObservationSummary } from '$lib/calibration/observation';

export type ObservationRow = {
	id: string;
	teamId: string;
	name: string;
	originalFilename: string;
	sizeBytes: number;
	sha256: string;
	summary: ObservationSummary;
	uploadedByEmail: string | null;
	createdAt: Date;
};

const columns = {
	id: observations.id,
	teamId: observations.teamId,
	name: observations.name,
	originalFilename: observations.originalFilename,
	sizeBytes: observations.sizeBytes,
	sha256: observations.sha256,
	summary: observations.summary,
	uploadedByEmail: users.email,
	createdAt: observations.createdAt
};

export async function insertObservation(
	db: Executor,
	o: { teamId: string; name: string; originalBytes: Buffer; originalFilename: string; sha256: string; summary: ObservationSummary; uploadedBy: string | null }
): Promise<{ id: string }> {
	const [row] = await db
		.insert(observations)
		.values({ ...o, sizeBytes: o.originalBytes.length })
		.returning({ id: observations.id });
	if (!row) throw new Error('insert into observations returned no row');
	return row;
}

export async function findObservationBySha(db: Executor, teamId: string, sha256: string): Promise<{ id: string; name: string } | null> {
	const rows = await db
		.select({ id: observations.id, name: observations.name })
		.from(observations)
		.where(and(eq(observations.teamId, teamId), eq(observations.sha256, sha256)))
		.limit(1);
	return rows[0] ?? null;
}

export async function getObservation(db: Executor, id: string): Promise<ObservationRow | null> {
	const rows = await db.select(columns).from(observations).leftJoin(users, eq(users.id, observations.uploadedBy)).where(eq(observations.id, id)).limit(1);
	return rows[0] ?? null;
}

export async function getObservationBytes(db: Executor, id: string): Promise<Buffer | null> {
	const rows = await db.select({ b: observations.originalBytes }).from(observations).where(eq(observations.id, id)).limit(1);
	return rows[0]?.b ?? null;
}

export async function listObservations(db: Executor, teamId: string): Promise<ObservationRow[]> {
	return db
		.select(columns)
		.from(observations)
		.leftJoin(users, eq(users.id, observations.uploadedBy))
		.where(eq(observations.teamId, teamId))
		.orderBy(desc(observations.createdAt));
}
