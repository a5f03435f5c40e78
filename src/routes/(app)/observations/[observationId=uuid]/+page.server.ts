import { error } from '@sveltejs/kit';
import type { PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getObservation } from '$lib/server/db/queries/observations';
import { requireUser, requireCan } from '$lib/server/guards';
import { scanDurationS, scanStatistics, type FieldScanStatistics } from '$lib/calibration/observation';
import type { ObservationSummary } from '$lib/calibration/observation';

export type ObservationPageData = {
	id: string;
	teamId: string;
	sha256: string;
	filename: string;
	uploadedBy: string | null;
	createdAt: string;
	summary: ObservationSummary;
	stats: FieldScanStatistics[];
	scans: { id: number; field: string; start: string; end: string; durationS: number }[];
	demoBundle: boolean;
};

export const load: PageServerLoad = async (event): Promise<ObservationPageData> => {
	requireUser(event);
	const o = await getObservation(getDb(), event.params.observationId);
	if (!o) error(404, { message: 'No such observation.', code: 'not_found' });
	requireCan(event, 'observation.view', { teamId: o.teamId }, 'observation.view');
	const fieldName = new Map(o.summary.fields.map((f) => [f.id, f.name]));
	return {
		id: o.id,
		teamId: o.teamId,
		sha256: o.sha256,
		filename: o.originalFilename,
		uploadedBy: o.uploadedByEmail,
		createdAt: o.createdAt.toISOString(),
		summary: o.summary,
		stats: scanStatistics(o.summary),
		scans: o.summary.scans.map((s) => ({ id: s.id, field: fieldName.get(s.field_id) ?? `#${s.field_id}`, start: s.start_utc, end: s.end_utc, durationS: scanDurationS(s) })),
		demoBundle: o.originalFilename === 'corrie-flats-demo.json'
	};
};
