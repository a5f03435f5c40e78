/**
 * Validation speed on a large observation: a seeded 64-antenna, 500-scan, 4-window summary; its default recipe is
 * validated many times and the summary's JSON text is parsed in the same run for comparison.
 * Target (brief): median validate < 2 ms and ≤ 3× the JSON.parse median. Prints figures; asserts nothing.
 * Run: npx tsx bench/validate.bench.ts   (npm run bench:validate)
 */
import { createDefaultRecipe } from '../src/lib/calibration/defaults';
import type { ObservationSummary } from '../src/lib/calibration/observation-schema';
import { validate } from '../src/lib/calibration/validate';
import { measureMedianMs } from './measure';

function createRandom(seed: number): () => number {
	let s = seed >>> 0;
	return () => {
		s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
		return s / 4294967296;
	};
}

function createLargeObservation(seed: number): ObservationSummary {
	const random = createRandom(seed);
	const fields: ObservationSummary['fields'] = [
		{ id: 0, name: '3C286', ra_deg: 202.7845338, dec_deg: 30.5091553, intents: ['flux_calibrator', 'bandpass_calibrator', 'delay_calibrator'] },
		...Array.from({ length: 6 }, (_, i) => ({ id: 1 + i, name: `BENCH-GCAL-${i}`, ra_deg: 190 + 5 * i, dec_deg: 20 + random() * 10, intents: ['gain_calibrator' as const] })),
		...Array.from({ length: 24 }, (_, i) => ({ id: 7 + i, name: `BENCH-TARGET-${i}`, ra_deg: 190 + 1.25 * i, dec_deg: 20 + random() * 10, intents: ['target' as const] }))
	];
	const epoch = Date.UTC(2026, 0, 1);
	const scans: ObservationSummary['scans'] = [];
	let t = 0;
	for (let i = 0; i < 500; i++) {
		const fieldId = i === 0 || i === 499 ? 0 : i % 2 === 1 ? 1 + (Math.floor(i / 8) % 6) : 7 + (Math.floor(i / 2) % 24);
		const len = fieldId === 0 ? 600 : fieldId < 7 ? 120 : 480;
		scans.push({
			id: i + 1,
			field_id: fieldId,
			start_utc: new Date(epoch + t * 1000).toISOString(),
			end_utc: new Date(epoch + (t + len) * 1000).toISOString(),
			spw_ids: [0, 1, 2, 3]
		});
		t += len + 20;
	}
	return {
		format: 'phasewright.observation',
		format_version: 1,
		name: 'bench',
		array: {
			name: 'Bench Array',
			antennas: Array.from({ length: 64 }, (_, i) => ({ name: `B${i}`, east_m: (random() - 0.5) * 8000, north_m: (random() - 0.5) * 8000, up_m: 0, diameter_m: 13.5 })),
			sefd_jy: 420,
			correlator_efficiency: 0.95
		},
		integration_s: 8,
		correlations: ['XX', 'YY'],
		spectral_windows: Array.from({ length: 4 }, (_, i) => ({ id: i, n_chan: 1024, first_freq_hz: 1.0e9 + i * 0.5e9, chan_width_hz: 488281.25 })),
		fields,
		scans,
		flagged_antennas: ['B7', 'B40']
	};
}


const observation = createLargeObservation(7);
const text = JSON.stringify(observation);
const recipe = createDefaultRecipe(observation);
let sink = 0;
const validateMs = measureMedianMs(() => {
	sink += validate(recipe, observation).length;
}, 500);
const parseMs = measureMedianMs(() => {
	sink += (JSON.parse(text) as ObservationSummary).scans.length;
}, 500);
const findings = validate(recipe, observation);
console.log(JSON.stringify({
	antennas: observation.array.antennas.length,
	scans: observation.scans.length,
	spectral_windows: observation.spectral_windows.length,
	summary_bytes: text.length,
	findings: findings.length,
	errors: findings.filter((f) => f.severity === 'error').length,
	validate_median_ms: Number(validateMs.toFixed(4)),
	json_parse_median_ms: Number(parseMs.toFixed(4)),
	ratio_validate_to_parse: Number((validateMs / parseMs).toFixed(2)),
	target: 'validate < 2 ms and ratio <= 3',
	checksum: sink % 1000
}, null, 2));
