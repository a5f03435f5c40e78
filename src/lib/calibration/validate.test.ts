import { afterAll, describe, expect, it } from 'vitest';
import { createDefaultRecipe } from './defaults';
import { createDemoObservation } from './demo-observation';
import type { ObservationSummary } from './observation-schema';
import type { RecipeParams, Step } from './recipe';
import { hasErrors, parseRulePolicy, RULES, validate, type Finding, type RulePolicy } from './validate';

const tested = new Set<string>();

function setup(): { recipe: RecipeParams; obs: ObservationSummary } {
	const obs = createDemoObservation();
	return { recipe: createDefaultRecipe(obs), obs };
}

function findStep<K extends Step['kind']>(recipe: RecipeParams, kind: K): Extract<Step, { kind: K }> {
	const step = recipe.steps.find((s): s is Extract<Step, { kind: K }> => s.kind === kind);
	if (!step) throw new Error(`test setup: no ${kind} step`);
	return step;
}

/** Findings of one code after a change; records that the code was exercised. */
function check(code: string, change: (r: RecipeParams, o: ObservationSummary) => void, policy?: RulePolicy): Finding[] {
	tested.add(code);
	const { recipe, obs } = setup();
	change(recipe, obs);
	return validate(recipe, obs, policy).filter((f) => f.code === code);
}

describe('the demo observation and its default recipe', () => {
	it('validates with no errors and no warnings', () => {
		const { recipe, obs } = setup();
		const findings = validate(recipe, obs);
		expect(hasErrors(findings)).toBe(false);
		expect(findings.filter((f) => f.severity === 'warning')).toEqual([]);
	});

	it('notes when no observation is given and still checks the recipe alone', () => {
		const { recipe } = setup();
		recipe.steps.reverse();
		const findings = validate(recipe);
		expect(findings[0]?.code).toBe('context.no_observation');
		expect(findings.some((f) => f.code === 'order.step_out_of_order')).toBe(true);
	});
});

describe('order rules', () => {
	it('flags a step out of the required order, not a correct order', () => {
		// Order delay → bandpass_prep → bandpass → gain → flux_bootstrap → apply → verify (METHODS.md §13, common practice).
		const hits = check('order.step_out_of_order', (r) => {
			const [a, b] = [r.steps[2], r.steps[3]];
			if (a && b) [r.steps[2], r.steps[3]] = [b, a];
		});
		expect(hits).toHaveLength(1);
		expect(hits[0]?.path).toBe('steps[3].kind');
		expect(check('order.step_out_of_order', () => {})).toEqual([]);
	});

	it('flags a duplicate step', () => {
		const hits = check('order.duplicate_step', (r) => r.steps.splice(4, 0, structuredClone(findStep(r, 'gain'))));
		expect(hits.map((h) => h.path)).toEqual(['steps[4]']);
		expect(check('order.duplicate_step', () => {})).toEqual([]);
	});

	it('flags a bandpass without a delay step unless a reason is given', () => {
		const hits = check('order.missing_input', (r) => r.steps.splice(0, 1));
		expect(hits.map((h) => h.path)).toEqual(['steps[1]']);
		expect(hits[0]?.message).toMatch(/without_delay_reason/);
		expect(
			check('order.missing_input', (r) => {
				r.steps.splice(0, 1);
				findStep(r, 'bandpass').without_delay_reason = 'delays were removed at the correlator';
			})
		).toEqual([]);
	});

	it('flags a bootstrap of a field the gain step does not solve, and apply/verify without their inputs', () => {
		const boot = check('order.missing_input', (r) => {
			findStep(r, 'gain').fields = ['CFA-GCAL-1'];
		});
		expect(boot.map((h) => h.path)).toEqual(['steps[3].fields']);
		const noGain = check('order.missing_input', (r) => {
			r.steps = r.steps.filter((s) => s.kind !== 'gain' && s.kind !== 'flux_bootstrap' && s.kind !== 'apply');
		});
		expect(noGain.map((h) => h.message)).toEqual(['the verify step has no apply step before it']);
	});
});

describe('provisional phase (bandpass_prep) rules', () => {
	it('flags an interval shorter than the bandpass scan and explains the trade-off with SNR figures', () => {
		const hits = check('prep.interval_shorter_than_scan', (r) => {
			findStep(r, 'bandpass_prep').interval = { mode: 'seconds', seconds: 64 };
		});
		expect(hits).toHaveLength(1);
		expect(hits[0]?.severity).toBe('error');
		expect(hits[0]?.path).toBe('steps[1].interval');
		// METHODS.md §5: the constant per-scan phase is absorbed by B; shorter intervals remove in-scan decorrelation.
		expect(hits[0]?.why).toMatch(/absorb/);
		expect(hits[0]?.why).toMatch(/decorrelation/);
		// 3C286 (~15 Jy near 1.25 GHz, Perley & Butler 2017) on 27 dishes of SEFD 420 Jy over ~50 MHz of clean band has
		// SNR far above 3 in one 8 s integration (radiometer equation, METHODS.md §9), so the shortest interval is 8 s.
		expect(hits[0]?.why).toMatch(/at the scan length \(600 s\)/);
		expect(hits[0]?.why).toMatch(/shortest interval meeting the phase-only threshold of 3 is 8 s/);
	});

	it('accepts an interval at least as long as the longest bandpass scan', () => {
		// The demo's 3C286 scans last 10 min (DESIGN.md demo scenario).
		expect(check('prep.interval_shorter_than_scan', (r) => {
			findStep(r, 'bandpass_prep').interval = { mode: 'seconds', seconds: 600 };
		})).toEqual([]);
		expect(check('prep.interval_shorter_than_scan', (r) => {
			findStep(r, 'bandpass_prep').interval = { mode: 'observation' };
		})).toEqual([]);
	});

	it('lets a team policy relax it to a warning, and records the change', () => {
		const policy: RulePolicy = { overrides: { 'prep.interval_shorter_than_scan': 'warning' } };
		const hits = check('prep.interval_shorter_than_scan', (r) => {
			findStep(r, 'bandpass_prep').interval = { mode: 'integration' };
		}, policy);
		expect(hits[0]?.severity).toBe('warning');
		expect(hits[0]?.policy).toEqual({ from: 'error', to: 'warning' });
		const off = check('prep.interval_shorter_than_scan', (r) => {
			findStep(r, 'bandpass_prep').interval = { mode: 'integration' };
		}, { overrides: { 'prep.interval_shorter_than_scan': 'off' } });
		expect(off).toEqual([]);
	});

	it('flags a prep step without clean channels', () => {
		expect(check('prep.no_clean_channels', (r) => (r.clean_channels = [])).map((h) => h.path)).toEqual(['clean_channels']);
		expect(check('prep.no_clean_channels', () => {})).toEqual([]);
	});
});

describe('role rules', () => {
	it('flags a missing flux calibrator', () => {
		expect(check('roles.no_flux_calibrator', (r) => (r.fields[0] = { name: '3C286', roles: ['bandpass_calibrator'] }))).toHaveLength(1);
		expect(check('roles.no_flux_calibrator', () => {})).toEqual([]);
	});

	it('flags a flux calibrator without a model', () => {
		expect(check('roles.no_flux_model', (r) => (r.flux_models = [])).map((h) => h.path)).toEqual(['fields[0]']);
		expect(check('roles.no_flux_model', () => {})).toEqual([]);
	});

	it('flags a missing bandpass calibrator', () => {
		expect(check('roles.no_bandpass_calibrator', (r) => (r.fields[0] = { name: '3C286', roles: ['flux_calibrator'] }))).toHaveLength(1);
		expect(check('roles.no_bandpass_calibrator', () => {})).toEqual([]);
	});

	it('flags a target without a gain calibrator and a non-calibrator named as one', () => {
		const hits = check('roles.target_without_gain_calibrator', (r) => {
			r.targets = r.targets.slice(1);
			const first = r.targets[0];
			if (first) first.gain_calibrator = 'Nursery-North';
		});
		expect(hits.map((h) => h.path)).toEqual(['fields[2]', 'targets[0].gain_calibrator']);
		expect(check('roles.target_without_gain_calibrator', () => {})).toEqual([]);
	});

	it('flags a field that is both target and calibrator', () => {
		expect(check('roles.target_and_calibrator', (r) => r.fields[2]?.roles.push('gain_calibrator')).map((h) => h.path)).toEqual(['fields[2].roles']);
		expect(check('roles.target_and_calibrator', () => {})).toEqual([]);
	});

	it('flags a field listed twice', () => {
		expect(check('roles.duplicate_field', (r) => r.fields.push({ name: 'CFA-GCAL-1', roles: ['gain_calibrator'] }))).toHaveLength(1);
		expect(check('roles.duplicate_field', () => {})).toEqual([]);
	});
});

describe('field and window references', () => {
	it('flags names that are not in the observation', () => {
		const hits = check('fields.unknown', (r) => {
			findStep(r, 'apply').fields.push('Nursery-East');
		});
		expect(hits.map((h) => h.path)).toEqual(['steps[5].fields[4]']);
		expect(check('fields.unknown', () => {})).toEqual([]);
	});

	it('flags a spectral window the observation lacks', () => {
		expect(check('spw.unknown', (r) => (r.spectral_window_id = 3))[0]?.message).toMatch(/no spectral window 3/);
		expect(check('spw.unknown', () => {})).toEqual([]);
	});

	it('warns when a solve is put on a field of another role', () => {
		expect(check('steps.role_mismatch', (r) => findStep(r, 'gain').fields.push('Nursery-North')).map((h) => h.path)).toEqual(['steps[3].fields[2]']);
		expect(check('steps.role_mismatch', () => {})).toEqual([]);
	});

	it('flags a target that the apply step does not correct', () => {
		expect(check('coverage.apply_missing_target', (r) => (findStep(r, 'apply').fields = ['3C286', 'CFA-GCAL-1', 'Nursery-North']))[0]?.message).toMatch(/Nursery-South/);
		expect(check('coverage.apply_missing_target', () => {})).toEqual([]);
	});
});

describe('gain calibrator distance', () => {
	it('warns beyond ~15° and gives the separation', () => {
		// Threshold ~15° (common practice, METHODS.md §10). (150°, 2°)–(160°, 9°) = 12.16356° (METHODS.md §10) stays
		// below it; moving the target to dec −10° at the gain calibrator's RA puts it 35° away (a meridian arc).
		const near = check('gain.calibrator_far_from_target', (_r, o) => {
			const [g, t] = [o.fields[1], o.fields[2]];
			if (g && t) {
				Object.assign(g, { ra_deg: 150, dec_deg: 2 });
				Object.assign(t, { ra_deg: 160, dec_deg: 9 });
			}
		});
		// Only Nursery-North (targets[0]) was moved next to the calibrator; Nursery-South is now far from it.
		expect(near.map((h) => h.path)).toEqual(['targets[1].gain_calibrator']);
		const far = check('gain.calibrator_far_from_target', (_r, o) => {
			const t = o.fields[2];
			if (t) Object.assign(t, { ra_deg: 210.5, dec_deg: -10 });
		});
		expect(far[0]?.path).toBe('targets[0].gain_calibrator');
		expect(far[0]?.message).toMatch(/35\.0°/);
	});
});

describe('reference antenna rules', () => {
	it('flags an unknown primary', () => {
		expect(check('refant.unknown', (r) => (r.reference_antenna.primary = 'CF99'))).toHaveLength(1);
		expect(check('refant.unknown', () => {})).toEqual([]);
	});

	it('flags a primary without data in the calibrator scans (flagged)', () => {
		expect(check('refant.not_in_calibrator_scans', (r) => (r.reference_antenna.primary = 'CF17'))[0]?.message).toMatch(/flagged_antennas/);
		expect(check('refant.not_in_calibrator_scans', () => {})).toEqual([]);
	});

	it('flags fallbacks that repeat, are the primary, or do not exist', () => {
		const hits = check('refant.fallback_invalid', (r) => {
			r.reference_antenna.fallbacks = [r.reference_antenna.primary, 'CF05', 'CF05', 'CF77'];
		});
		expect(hits.map((h) => h.path)).toEqual(['reference_antenna.fallbacks[0]', 'reference_antenna.fallbacks[2]', 'reference_antenna.fallbacks[3]']);
		expect(check('refant.fallback_invalid', () => {})).toEqual([]);
	});

	it('warns about a flagged fallback', () => {
		expect(check('refant.fallback_flagged', (r) => r.reference_antenna.fallbacks.push('CF17'))).toHaveLength(1);
		expect(check('refant.fallback_flagged', () => {})).toEqual([]);
	});
});

describe('channel rules', () => {
	it('flags a reversed range', () => {
		expect(check('channels.reversed', (r) => (r.excluded_channels = [{ start: 20, end: 10 }])).map((h) => h.path)).toEqual(['excluded_channels[0]']);
		expect(check('channels.reversed', (r) => (r.excluded_channels = [{ start: 10, end: 10 }]))).toEqual([]);
	});

	it('flags a range beyond the last channel (0..n_chan−1)', () => {
		expect(check('channels.out_of_range', (r) => (r.excluded_channels = [{ start: 1000, end: 1024 }]))).toHaveLength(1);
		expect(check('channels.out_of_range', (r) => (r.excluded_channels = [{ start: 1000, end: 1023 }]))).toEqual([]);
	});

	it('flags clean channels that are also excluded', () => {
		expect(check('channels.clean_overlaps_excluded', (r) => (r.excluded_channels = [{ start: 500, end: 510 }]))[0]?.message).toMatch(/500–510/);
		expect(check('channels.clean_overlaps_excluded', (r) => (r.excluded_channels = [{ start: 0, end: 460 }]))).toEqual([]);
	});

	it('warns about overlapping ranges in one list', () => {
		expect(check('channels.ranges_overlap', (r) => (r.excluded_channels = [{ start: 0, end: 20 }, { start: 20, end: 30 }]))).toHaveLength(1);
		expect(check('channels.ranges_overlap', (r) => (r.excluded_channels = [{ start: 0, end: 20 }, { start: 21, end: 30 }]))).toEqual([]);
	});

	it('flags too few clean channels for the SNR asked', () => {
		// With a 0.005 Jy manual model the radiometer equation (METHODS.md §9) gives SNR well below 3 on one
		// 488 kHz channel over 600 s for 27 antennas of SEFD 420 Jy: S·η·√(2·2·Δν·t)·√26/SEFD ≈ 0.005·0.95·1082·5.1/420 ≈ 0.06.
		const hits = check('channels.too_few_clean', (r) => {
			r.clean_channels = [{ start: 500, end: 500 }];
			r.flux_models = [{ field: '3C286', model: { kind: 'manual', flux_jy: 0.005, ref_freq_hz: 1.25e9, spectral_index: 0, curvature: 0 } }];
		});
		expect(hits[0]?.message).toMatch(/^1 clean channel\(s\)/);
		expect(check('channels.too_few_clean', () => {})).toEqual([]);
	});
});

describe('delay search window', () => {
	it('flags a window beyond the unambiguous range 1/(2|Δν|)', () => {
		// 488.28125 kHz channels: ±1024 ns unambiguous (METHODS.md §2: |τ| < 1/(2|Δν|)).
		const hits = check('delay.window_beyond_unambiguous', (r) => (findStep(r, 'delay').search_window_ns = 1100));
		expect(hits[0]?.message).toMatch(/±1024\.0 ns/);
		expect(check('delay.window_beyond_unambiguous', (r) => (findStep(r, 'delay').search_window_ns = 1000))).toEqual([]);
	});

	it('warns about a window much wider than the typical few ns', () => {
		// Typical residual delays are a few ns (common practice, METHODS.md §2); the project warns above 100 ns.
		expect(check('delay.window_wide', (r) => (findStep(r, 'delay').search_window_ns = 150))).toHaveLength(1);
		expect(check('delay.window_wide', (r) => (findStep(r, 'delay').search_window_ns = 100))).toEqual([]);
	});
});

describe('interval rules', () => {
	it('flags an interval shorter than one integration', () => {
		expect(check('interval.shorter_than_integration', (r) => (findStep(r, 'gain').interval = { mode: 'seconds', seconds: 4 }))).toHaveLength(1);
		expect(check('interval.shorter_than_integration', (r) => (findStep(r, 'gain').interval = { mode: 'seconds', seconds: 8 }))).toEqual([]);
	});

	it('warns when the gain interval averages across the calibrator scans', () => {
		// The demo's gain-calibrator scans last 2 min.
		const hits = check('interval.gain_longer_than_scan', (r) => (findStep(r, 'gain').interval = { mode: 'seconds', seconds: 900 }));
		expect(hits.some((h) => h.message.includes('"CFA-GCAL-1" (longest 120 s)'))).toBe(true);
		expect(check('interval.gain_longer_than_scan', (r) => (findStep(r, 'gain').interval = { mode: 'seconds', seconds: 120 }))).toEqual([]);
	});
});

/** An observation matching the METHODS.md §9 worked example: N = 64, SEFD 400 Jy, η_c = 1, 200 MHz, 8 s, one correlation. */
function useWorkedExample(r: RecipeParams, o: ObservationSummary, scanMinutes: number): void {
	o.array.antennas = Array.from({ length: 64 }, (_, i) => ({ name: `W${i}`, east_m: 10 * i, north_m: 0, up_m: 0, diameter_m: 25 }));
	o.flagged_antennas = [];
	o.array.sefd_jy = 400;
	o.array.correlator_efficiency = 1;
	o.correlations = ['XX'];
	o.spectral_windows = [{ id: 0, n_chan: 1024, first_freq_hz: 1.0e9, chan_width_hz: 195312.5 }];
	for (const s of o.scans) {
		if (s.field_id === 1) s.end_utc = new Date(Date.parse(s.start_utc) + scanMinutes * 60000).toISOString();
	}
	r.reference_antenna = { primary: 'W0', fallbacks: [] };
	r.clean_channels = [{ start: 0, end: 1023 }];
	r.flux_estimates = [{ field: 'CFA-GCAL-1', flux_jy: 0.002 }];
	findStep(r, 'gain').interval = { mode: 'integration' };
	findStep(r, 'gain').min_snr = 10;
}

describe('SNR rules (Wrobel & Walker 1999, via METHODS.md §9)', () => {
	it('warns below the threshold and gives the shortest interval that reaches it', () => {
		// Worked example: S = 2 mJy, SNR_ant = 10, 1 correlation, η_c = 1 → t_min 158.73 s → t_sol 160 s.
		const hits = check('snr.below_minimum', (r, o) => useWorkedExample(r, o, 5));
		expect(hits).toHaveLength(1);
		expect(hits[0]?.message).toMatch(/"CFA-GCAL-1"/);
		expect(hits[0]?.message).toMatch(/160 s \(20 integrations\) would reach it/);
		expect(check('snr.below_minimum', (r, o) => {
			useWorkedExample(r, o, 5);
			findStep(r, 'gain').interval = { mode: 'seconds', seconds: 160 };
		})).toEqual([]);
	});

	it('reports infeasible when even the scan is too short', () => {
		// Same example with 2 min scans: 158.73 s needed > 120 s available (project choice, METHODS.md §9).
		const hits = check('snr.infeasible', (r, o) => useWorkedExample(r, o, 2));
		expect(hits[0]?.message).toMatch(/needs 159 s, longer than its longest scan \(120 s\)/);
		expect(check('snr.infeasible', (r, o) => useWorkedExample(r, o, 5))).toEqual([]);
	});

	it('notes a gain calibrator without a flux estimate', () => {
		expect(check('snr.flux_unknown', () => {})[0]?.message).toMatch(/"CFA-GCAL-1"/);
		expect(check('snr.flux_unknown', (r) => (r.flux_estimates = [{ field: 'CFA-GCAL-1', flux_jy: 2 }]))).toEqual([]);
	});

	it('notes a missing SEFD or correlator efficiency', () => {
		expect(check('snr.sensitivity_unknown', (_r, o) => delete o.array.sefd_jy)[0]?.message).toMatch(/no sefd_jy/);
		expect(check('snr.sensitivity_unknown', (_r, o) => delete o.array.correlator_efficiency)[0]?.message).toMatch(/assume 0\.88/);
		expect(check('snr.sensitivity_unknown', () => {})).toEqual([]);
	});
});

describe('flux model rules', () => {
	it('warns when the window lies outside a standard\'s fitted range', () => {
		// PKS B1934-638 (Reynolds 1994) is fitted over 408–8640 MHz (METHODS.md §8); 3C286 (PB2017) over 0.05–50 GHz.
		const hits = check('flux.extrapolated', (_r, o) => {
			const w = o.spectral_windows[0];
			if (w) w.first_freq_hz = 9.0e9;
		});
		expect(hits).toEqual([]);
		const outside = check('flux.extrapolated', (r, o) => {
			const w = o.spectral_windows[0];
			if (w) w.first_freq_hz = 9.0e9;
			r.flux_models = [{ field: '3C286', model: { kind: 'standard', standard: 'PKS B1934-638' } }];
		});
		expect(outside).toHaveLength(1);
	});

	it('warns about an implausible manual spectral index', () => {
		const manual = (alpha: number) => (r: RecipeParams) => {
			r.flux_models = [{ field: '3C286', model: { kind: 'manual', flux_jy: 15, ref_freq_hz: 1.4e9, spectral_index: alpha, curvature: 0 } }];
		};
		expect(check('flux.manual_implausible', manual(-7))).toHaveLength(1);
		expect(check('flux.manual_implausible', manual(-0.5))).toEqual([]);
	});

	it('warns when a standard is given to a field that is not that source', () => {
		expect(check('flux.standard_mismatch', (r) => (r.flux_models = [{ field: '3C286', model: { kind: 'standard', standard: '3C48' } }]))[0]?.message).toMatch(/looks like 3C286/);
		expect(check('flux.standard_mismatch', () => {})).toEqual([]);
	});
});

describe('rule policy', () => {
	it('accepts known codes and rejects unknown or locked ones', () => {
		expect(parseRulePolicy({ overrides: { 'prep.interval_shorter_than_scan': 'warning' } }).ok).toBe(true);
		const bad = parseRulePolicy({ overrides: { 'prep.nope': 'off', 'fields.unknown': 'off' } });
		expect(bad.ok).toBe(false);
		if (!bad.ok) expect(bad.error.issues.map((i) => i.path)).toEqual(['$.overrides["prep.nope"]', '$.overrides["fields.unknown"]']);
		const typo = parseRulePolicy({ overrides: { 'prep.interval_shorter_than_scan': 'relaxed' } });
		expect(typo.ok).toBe(false);
	});

	it('ignores an override of a locked rule in validate', () => {
		const hits = check('fields.unknown', (r) => findStep(r, 'apply').fields.push('Nowhere'), { overrides: { 'fields.unknown': 'off' } });
		expect(hits).toHaveLength(1);
		expect(hits[0]?.policy).toBeUndefined();
	});
});

describe('the registry', () => {
	it('has unique codes, and every finding carries its source and why', () => {
		const codes = RULES.map((r) => r.code);
		expect(new Set(codes).size).toBe(codes.length);
		for (const r of RULES) {
			expect(r.source.length).toBeGreaterThan(0);
			expect(r.why.length).toBeGreaterThan(20);
		}
	});

	afterAll(() => {
		// Every rule has a test above that triggers it (and one that does not).
		const missing = RULES.map((r) => r.code).filter((c) => !tested.has(c));
		if (missing.length > 0) throw new Error(`rules without tests: ${missing.join(', ')}`);
	});
});
