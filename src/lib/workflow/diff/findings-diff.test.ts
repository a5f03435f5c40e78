import { describe, expect, it } from 'vitest';
import type { Finding } from '../../calibration/rules/types';
import { diffFindings } from './findings-diff';

// Invented findings; only code, path and severity matter to the comparison.
function finding(code: string, path: string, severity: Finding['severity'], message = `${code} at ${path}`): Finding {
	return { code, severity, path, message, why: 'test', source: 'common practice' };
}

describe('diffFindings', () => {
	it('reports findings that appeared and disappeared between versions', () => {
		const gone = finding('interval.too_short', 'steps[2].interval', 'warning');
		const kept = finding('refant.flagged', 'reference_antenna.primary', 'error');
		const fresh = finding('channels.outside_window', 'clean_channels[0]', 'error');
		const result = diffFindings([gone, kept], [kept, fresh]);
		expect(result).toEqual({ appeared: [fresh], disappeared: [gone], severityChanged: [], unchanged: 1 });
	});

	it('reports a changed severity for the same code and path', () => {
		const before = finding('snr.low', 'steps[3].min_snr', 'warning');
		const after = finding('snr.low', 'steps[3].min_snr', 'error');
		expect(diffFindings([before], [after])).toEqual({
			appeared: [],
			disappeared: [],
			severityChanged: [{ before, after, from: 'warning', to: 'error' }],
			unchanged: 0
		});
	});

	it('treats the same rule at another path as a different finding', () => {
		const a = finding('snr.low', 'steps[3].min_snr', 'warning');
		const b = finding('snr.low', 'steps[4].min_snr', 'warning');
		const result = diffFindings([a], [b]);
		expect(result.appeared).toEqual([b]);
		expect(result.disappeared).toEqual([a]);
	});

	it('ignores a reworded message when code, path and severity are the same', () => {
		const result = diffFindings([finding('snr.low', 'steps[3].min_snr', 'warning', 'SNR 2.1')], [finding('snr.low', 'steps[3].min_snr', 'warning', 'SNR 2.4')]);
		expect(result).toMatchObject({ appeared: [], disappeared: [], severityChanged: [], unchanged: 1 });
	});

	it('pairs repeated findings of one code and path in order, reporting the extra one', () => {
		const one = finding('fields.unknown', 'steps[5].fields', 'error', 'CF-X');
		const two = finding('fields.unknown', 'steps[5].fields', 'error', 'CF-Y');
		const result = diffFindings([one, two], [one]);
		expect(result.unchanged).toBe(1);
		expect(result.disappeared).toEqual([two]);
	});
});

describe('diffFindings with repeated identical findings', () => {
	it('counts each copy once', () => {
		const same = finding('fields.unknown', 'steps[5].fields', 'error');
		expect(diffFindings([same, same], [same])).toEqual({ appeared: [], disappeared: [same], severityChanged: [], unchanged: 1 });
	});
});
