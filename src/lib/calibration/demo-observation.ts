import type { ObservationSummary } from './observation-schema';

/*
 * The invented demo observation (DESIGN.md "Demo scenario"): the fictional Corrie Flats Array, 28 dishes of
 * 13.5 m, an L-band-like window, the flux standard 3C286 at its catalogued position (METHODS.md §10), an
 * invented gain calibrator and two invented targets. Antenna positions come from a fixed seed so the data are
 * deterministic; `tests/fixtures/observations/demo.json` holds the same summary as a file.
 */

const DEMO_SEED = 20260314;
const EPOCH_MS = Date.UTC(2026, 2, 14, 20, 0, 0);

/** A small deterministic generator (mulberry32); the demo must not depend on a clock or real randomness. */
function createSeededRandom(seed: number): () => number {
	let state = seed >>> 0;
	return () => {
		state = (state + 0x6d2b79f5) >>> 0;
		let t = state;
		t = Math.imul(t ^ (t >>> 15), t | 1);
		t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
		return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
	};
}

function roundTo(value: number, step: number): number {
	return Math.round(value / step) * step;
}

function formatUtc(offsetS: number): string {
	return new Date(EPOCH_MS + offsetS * 1000).toISOString().replace('.000Z', 'Z');
}

function createAntennas(): ObservationSummary['array']['antennas'] {
	const random = createSeededRandom(DEMO_SEED);
	return Array.from({ length: 28 }, (_, i) => {
		// Squaring the radius draw concentrates dishes in a core, as real layouts do; the outermost reach ~4 km.
		const radius = i === 0 ? 0 : 4000 * random() ** 2;
		const angle = 2 * Math.PI * random();
		return {
			name: `CF${String(i + 1).padStart(2, '0')}`,
			east_m: roundTo(radius * Math.cos(angle), 0.01),
			north_m: roundTo(radius * Math.sin(angle), 0.01),
			up_m: roundTo((random() - 0.5) * 6, 0.01),
			diameter_m: 13.5
		};
	});
}

function createScans(): ObservationSummary['scans'] {
	const scans: ObservationSummary['scans'] = [];
	let t = 0;
	const addScan = (fieldId: number, minutes: number) => {
		scans.push({ id: scans.length + 1, field_id: fieldId, start_utc: formatUtc(t), end_utc: formatUtc(t + minutes * 60), spw_ids: [0] });
		t += minutes * 60 + 30; // 30 s to slew and settle between scans
	};
	addScan(0, 10);
	for (let cycle = 0; cycle < 8; cycle++) {
		addScan(1, 2);
		addScan(cycle % 2 === 0 ? 2 : 3, 10);
	}
	addScan(1, 2);
	addScan(0, 10);
	return scans;
}

/** Build the demo observation summary (a fresh object each call). */
export function createDemoObservation(): ObservationSummary {
	return {
		format: 'phasewright.observation',
		format_version: 1,
		name: 'Stellar Nurseries Survey, session 1 (demo)',
		array: { name: 'Corrie Flats Array', antennas: createAntennas(), sefd_jy: 420, correlator_efficiency: 0.95 },
		integration_s: 8,
		correlations: ['XX', 'YY'],
		spectral_windows: [{ id: 0, n_chan: 1024, first_freq_hz: 1.0e9, chan_width_hz: 488281.25 }],
		fields: [
			// 13h31m08.2881s +30°30′32.959″ (METHODS.md §10)
			{ id: 0, name: '3C286', ra_deg: 202.7845338, dec_deg: 30.5091553, intents: ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'] },
			{ id: 1, name: 'CFA-GCAL-1', ra_deg: 210.5, dec_deg: 25.0, intents: ['gain_calibrator'] },
			{ id: 2, name: 'Nursery-North', ra_deg: 212.0, dec_deg: 31.5, intents: ['target'] },
			{ id: 3, name: 'Nursery-South', ra_deg: 208.7, dec_deg: 19.8, intents: ['target'] }
		],
		scans: createScans(),
		flagged_antennas: ['CF17']
	};
}
