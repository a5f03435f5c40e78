import type { Executor } from '../db/client';
import { inResultTransaction } from '../db/transaction';
import { findObservationBySha, insertObservation, listObservations } from '../db/queries/observations';
import { OBSERVATION_LIMITS, parseObservation } from '$lib/calibration/observation';
import { textSha256 } from '$lib/script/sha256';
import { fail, type DomainResult } from '$lib/workflow/errors';
import type { InputIssue } from '$lib/calibration/result';

export type UploadedObservation = { id: string; name: string; sha256: string; warnings: InputIssue[] };

/**
 * Parses an uploaded observation summary and stores its exact bytes, their SHA-256 and the
 * parsed summary in one transaction. Bad files store nothing and list every problem.
 */
export async function uploadObservation(
	db: Executor,
	input: { teamId: string; bytes: Uint8Array; filename: string; userId: string | null }
): Promise<DomainResult<UploadedObservation>> {
	if (input.bytes.length === 0) return fail('validation_failed', `${input.filename} is empty: choose an observation summary (.json).`);
	if (input.bytes.length > OBSERVATION_LIMITS.maxBytes) {
		return fail('validation_failed', `${input.filename} is ${input.bytes.length} bytes; the limit is ${OBSERVATION_LIMITS.maxBytes} bytes.`);
	}
	let text: string;
	try {
		// fatal: reject invalid UTF-8; ignoreBOM: keep the bytes, so the hash is of what was sent.
		text = new TextDecoder('utf-8', { fatal: true, ignoreBOM: true }).decode(input.bytes);
	} catch {
		return fail('validation_failed', `${input.filename} is not UTF-8 text: an observation summary is a JSON file.`);
	}
	const parsed = parseObservation(text.replace(/^\uFEFF/, ''));
	if (!parsed.ok) {
		return fail('validation_failed', `${input.filename} is not a valid phasewright.observation v1 summary (${parsed.error.issues.length} problem${parsed.error.issues.length === 1 ? '' : 's'}).`, parsed.error.issues);
	}
	const sha256 = textSha256(text);
	return inResultTransaction(db, async (tx) => {
		const existing = await findObservationBySha(tx, input.teamId, sha256);
		if (existing) return fail('conflict', `This exact file was uploaded before as "${existing.name}" (id ${existing.id}).`);
		const summary = parsed.value.summary;
		const row = await insertObservation(tx, {
			teamId: input.teamId,
			name: summary.name,
			originalBytes: Buffer.from(input.bytes),
			originalFilename: input.filename.slice(0, 255),
			sha256,
			summary,
			uploadedBy: input.userId
		});
		return { ok: true, value: { id: row.id, name: summary.name, sha256, warnings: parsed.value.warnings } };
	});
}

export type ObservationListItem = { id: string; name: string; array: string; antennas: number; fields: number; scans: number; sha256: string; uploadedBy: string | null; createdAt: string };

/** A team's observations as the list page and its API show them, newest first. */
export async function listObservationItems(db: Executor, teamId: string): Promise<ObservationListItem[]> {
	return (await listObservations(db, teamId)).map((o) => ({
		id: o.id,
		name: o.name,
		array: o.summary.array.name,
		antennas: o.summary.array.antennas.length,
		fields: o.summary.fields.length,
		scans: o.summary.scans.length,
		sha256: o.sha256,
		uploadedBy: o.uploadedByEmail,
		createdAt: o.createdAt.toISOString()
	}));
}
