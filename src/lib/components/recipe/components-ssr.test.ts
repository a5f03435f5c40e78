import { describe, expect, it } from 'vitest';
import { render } from 'svelte/server';
import { createDemoObservation } from '$lib/calibration/demo-observation';
import type { Finding } from '$lib/calibration/validate';
import AntennaLayout from './AntennaLayout.svelte';
import ChannelPicker from './ChannelPicker.svelte';
import FindingsList from './FindingsList.svelte';
import FluxSpectrum from './FluxSpectrum.svelte';
import ScanTimeline from './ScanTimeline.svelte';
import CodeViewer from '../code/CodeViewer.svelte';

/*
 * Server-rendering checks: each component renders its no-JS markup with the labels and text alternatives the
 * wizard relies on. Interaction (drag, focus, CodeMirror) is covered by the lead's Playwright tests.
 */

function count(html: string, needle: string): number {
	return html.split(needle).length - 1;
}

describe('server-rendered components', () => {
	it('ScanTimeline draws one rectangle per scan, a legend and a scan table', () => {
		const observation = createDemoObservation();
		const { body } = render(ScanTimeline, { props: { observation } });
		expect(count(body, 'data-testid="timeline-scan"')).toBe(observation.scans.length);
		expect(body).toContain('Colours appear once field roles are set.');
		expect(count(body, '<tr class="border-t')).toBe(observation.scans.length);
		// Exactly one scan is in the tab order (roving focus).
		expect(count(body, 'tabindex="0"')).toBe(1);
	});

	it('ScanTimeline colours scans by role once roles are set', () => {
		const observation = createDemoObservation();
		const roles = [{ name: '3C286', roles: ['flux_calibrator' as const, 'bandpass_calibrator' as const] }];
		const { body } = render(ScanTimeline, { props: { observation, roles } });
		// The demo observes 3C286 in its first and last scans.
		expect(count(body, 'data-role="flux_calibrator"')).toBe(2);
		expect(body).toContain('Flux calibrator');
	});

	it('ChannelPicker shows the typed ranges and the usable bandwidth', () => {
		// 100 clean channels minus 10 excluded ones = 90 × 0.4 MHz = 36 MHz (first principles).
		const { body } = render(ChannelPicker, {
			props: { nChan: 1024, chanWidthHz: 4e5, firstFreqHz: 1e9, clean: [{ start: 100, end: 199 }], excluded: [{ start: 150, end: 159 }], onchange: () => {} }
		});
		expect(body).toContain('value="100–199"');
		expect(body).toContain('value="150–159"');
		expect(body).toMatch(/data-testid="usable-clean"[^>]*>36\.000 MHz \(90 channels\)/);
		expect(body).toMatch(/data-testid="usable-window"[^>]*>405\.600 MHz \(1014 of 1024 channels\)/);
		expect(body).toContain('for="channels-clean"');
	});

	it('FindingsList shows "No findings" when empty and groups findings otherwise', () => {
		expect(render(FindingsList, { props: { findings: [], steps: [] } }).body).toContain('No findings');
		const findings: Finding[] = [
			{ code: 'x.one', severity: 'error', path: 'steps[0].interval', message: 'too short', why: 'SNR', source: 'common practice', policy: { from: 'warning', to: 'error' } },
			{ code: 'x.two', severity: 'note', path: 'reference_antenna.primary', message: 'far out', why: 'stability', source: 'project choice' }
		];
		const { body } = render(FindingsList, { props: { findings, steps: [{ kind: 'delay' }], onjump: () => {} } });
		expect(body).toContain('Step 1: Delay solve (K)');
		expect(body).toContain('Reference antenna');
		expect(body).toContain('changed this from warning to error');
		// Severity is given in words, not by colour alone.
		expect(body).toContain('Error');
		expect(body).toContain('Note');
		expect(count(body, '<button')).toBe(2);
	});

	it('FluxSpectrum prints the centre value and flags extrapolation', () => {
		// 3C286 at 1.4 GHz: 15.08 Jy, α = −0.501 (Perley & Butler 2017, via METHODS.md §8).
		const inside = render(FluxSpectrum, { props: { model: { kind: 'standard', standard: '3C286' }, minFreqHz: 1.0e9, maxFreqHz: 1.8e9 } }).body;
		expect(inside).toContain('15.08 Jy at 1.400 GHz, spectral index -0.501');
		expect(inside).not.toContain('data-testid="flux-extrapolated"');
		// PKS B1934-638 is fitted from 408 MHz (Reynolds 1994, via METHODS.md §8).
		const outside = render(FluxSpectrum, { props: { model: { kind: 'standard', standard: 'PKS B1934-638' }, minFreqHz: 300e6, maxFreqHz: 600e6 } }).body;
		expect(outside).toContain('data-testid="flux-extrapolated"');
		expect(outside).toContain('stroke-dasharray="5 4"');
	});

	it('AntennaLayout lists every antenna with its reason and marks the primary', () => {
		const observation = createDemoObservation();
		observation.flagged_antennas = ['CF05'];
		const { body } = render(AntennaLayout, { props: { observation, primary: 'CF01', fallbacks: ['CF02'], onchoose: () => {} } });
		expect(count(body, 'data-testid="antenna-row"')).toBe(28);
		expect(count(body, 'data-testid="antenna-marker"')).toBe(28);
		expect(body).toMatch(/data-name="CF05" data-eligible="false"/);
		expect(body).toContain('aria-current="true"');
		expect(body).toContain('fallback 1');
	});

	it('CodeViewer renders the program text in a <pre> before the editor loads', () => {
		const text = "x = 'a < b'\nprint(x)\n";
		const { body } = render(CodeViewer, { props: { text, label: 'Rendered program', filename: 'calibrate.py' } });
		// The text is escaped as HTML, not interpreted.
		expect(body).toContain("x = 'a &lt; b'");
		expect(body).toContain('data-testid="code-viewer-copy"');
		// Two newline-terminated lines.
		expect(body).toContain('2 lines');
	});
});
