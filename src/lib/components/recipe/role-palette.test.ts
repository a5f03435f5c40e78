import { describe, expect, it } from 'vitest';
import { fieldRoleSchema } from '$lib/calibration/field-role';
import { describeRoles, pickLeadingRole, ROLE_PRIORITY, ROLE_STYLES } from './role-palette';

describe('role palette', () => {
	it('covers every field role of DESIGN.md once, plus the neutral key', () => {
		expect([...ROLE_PRIORITY].sort()).toEqual([...fieldRoleSchema.options].sort());
		expect(Object.keys(ROLE_STYLES).sort()).toEqual([...fieldRoleSchema.options, 'unassigned'].sort());
	});

	it('keeps amber and rose for findings only (tailwind.config.ts palette note)', () => {
		for (const style of Object.values(ROLE_STYLES)) expect(`${style.fillClass} ${style.swatchClass}`).not.toMatch(/amber|rose|red|yellow/);
	});

	it('gives each role its own colour', () => {
		const fills = Object.values(ROLE_STYLES).map((s) => s.fillClass);
		expect(new Set(fills).size).toBe(fills.length);
	});

	it('picks the leading role by priority and describes roles in words', () => {
		expect(pickLeadingRole(['target', 'gain_calibrator'])).toBe('gain_calibrator');
		expect(pickLeadingRole(['bandpass_calibrator', 'flux_calibrator'])).toBe('flux_calibrator');
		expect(pickLeadingRole([])).toBe('unassigned');
		expect(pickLeadingRole(undefined)).toBe('unassigned');
		expect(describeRoles(['bandpass_calibrator', 'flux_calibrator'])).toBe('Flux calibrator, Bandpass calibrator');
		expect(describeRoles([])).toBe('No role yet');
	});
});
