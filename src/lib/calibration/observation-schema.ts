import { z } from 'zod';
import { fieldRoleSchema } from './field-role';

/** Count limits for one observation summary (project choice: well above real arrays, low enough to bound work). */
export const OBSERVATION_LIMITS = {
	maxBytes: 5_000_000,
	maxDepth: 16,
	antennas: 512,
	spectralWindows: 64,
	fields: 1000,
	scans: 20000,
	channels: 65536,
	nameLength: 200
} as const;

const name = z.string().min(1).max(OBSERVATION_LIMITS.nameLength);
const finite = z.number();
const utc = z.iso.datetime({ offset: true });

export const antennaSchema = z.strictObject({
	name,
	east_m: finite,
	north_m: finite,
	up_m: finite,
	diameter_m: z.number().positive()
});

export const correlationSchema = z.enum(['XX', 'XY', 'YX', 'YY', 'RR', 'RL', 'LR', 'LL']);
export type Correlation = z.infer<typeof correlationSchema>;

export const spectralWindowSchema = z.strictObject({
	id: z.int().min(0),
	n_chan: z.int().min(1).max(OBSERVATION_LIMITS.channels),
	first_freq_hz: z.number().positive(),
	// Signed: a window may run downwards in frequency; zero would make every channel the same frequency.
	chan_width_hz: z.number().refine((v) => v !== 0, { message: 'expected a non-zero channel width' })
});

export const fieldSchema = z.strictObject({
	id: z.int().min(0),
	name,
	ra_deg: z.number().min(0).lt(360),
	dec_deg: z.number().min(-90).max(90),
	intents: z.array(fieldRoleSchema).max(5).optional()
});

export const scanSchema = z.strictObject({
	id: z.int().min(1),
	field_id: z.int().min(0),
	start_utc: utc,
	end_utc: utc,
	spw_ids: z.array(z.int().min(0)).min(1).max(OBSERVATION_LIMITS.spectralWindows)
});

/** `phasewright.observation` v1 (DESIGN.md "Formats"). */
export const observationSummarySchema = z.strictObject({
	format: z.literal('phasewright.observation'),
	format_version: z.literal(1),
	name,
	array: z.strictObject({
		name,
		antennas: z.array(antennaSchema).min(1).max(OBSERVATION_LIMITS.antennas),
		sefd_jy: z.number().positive().optional(),
		correlator_efficiency: z.number().positive().max(1).optional()
	}),
	integration_s: z.number().positive(),
	correlations: z.array(correlationSchema).min(1).max(8),
	spectral_windows: z.array(spectralWindowSchema).min(1).max(OBSERVATION_LIMITS.spectralWindows),
	fields: z.array(fieldSchema).min(1).max(OBSERVATION_LIMITS.fields),
	scans: z.array(scanSchema).min(1).max(OBSERVATION_LIMITS.scans),
	flagged_antennas: z.array(name).max(OBSERVATION_LIMITS.antennas).default([])
});

export type ObservationSummary = z.infer<typeof observationSummarySchema>;
export type Antenna = z.infer<typeof antennaSchema>;
export type SpectralWindow = z.infer<typeof spectralWindowSchema>;
export type ObservationField = z.infer<typeof fieldSchema>;
export type Scan = z.infer<typeof scanSchema>;
