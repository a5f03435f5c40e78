import { describe, expect, it } from 'vitest';
import {
	addRange,
	convertChannelToX,
	convertRangeToRect,
	convertXToChannel,
	countChannels,
	describeRangeFrequency,
	findRangeAt,
	formatRanges,
	normaliseRanges,
	parseRanges,
	removeRangeAt,
	subtractRange,
	summariseChannels
} from './channel-ranges';

// Expected values are derived by hand (first principles: inclusive integer ranges, a linear channel ↔ pixel map).

describe('channel ↔ pixel mapping', () => {
	it('maps channel edges linearly and back', () => {
		// 1024 channels over 512 px: 2 channels per pixel.
		expect(convertChannelToX(0, 1024, 512)).toBe(0);
		expect(convertChannelToX(512, 1024, 512)).toBe(256);
		expect(convertXToChannel(256, 1024, 512)).toBe(512);
		expect(convertXToChannel(255.9, 1024, 512)).toBe(511);
	});

	it('clamps positions outside the strip to the first and last channel', () => {
		expect(convertXToChannel(-20, 1024, 512)).toBe(0);
		expect(convertXToChannel(512, 1024, 512)).toBe(1023);
		expect(convertXToChannel(9999, 1024, 512)).toBe(1023);
	});

	it('draws a range from its first channel edge to after its last, at least 1 px wide', () => {
		// 100 channels over 1000 px: 10 px each; channels 10–19 cover x 100..200.
		expect(convertRangeToRect({ start: 10, end: 19 }, 100, 1000)).toEqual({ x: 100, width: 100 });
		// One channel of 4096 over 400 px is 0.098 px, widened to 1 px; the last one still ends at 400.
		const last = convertRangeToRect({ start: 4095, end: 4095 }, 4096, 400);
		expect(last.width).toBe(1);
		expect(last.x + last.width).toBeLessThanOrEqual(400);
	});
});

describe('normalising and editing', () => {
	it('sorts, orients and merges overlapping and touching ranges', () => {
		expect(normaliseRanges([{ start: 500, end: 520 }, { start: 400, end: 100 }, { start: 390, end: 450 }, { start: 521, end: 530 }])).toEqual([
			{ start: 100, end: 450 },
			{ start: 500, end: 530 }
		]);
	});

	it('keeps ranges with a gap of one channel apart', () => {
		expect(normaliseRanges([{ start: 0, end: 9 }, { start: 11, end: 20 }])).toEqual([
			{ start: 0, end: 9 },
			{ start: 11, end: 20 }
		]);
	});

	it('clips to the window and drops ranges entirely outside it', () => {
		expect(normaliseRanges([{ start: 1000, end: 1100 }, { start: 2000, end: 2100 }], 1024)).toEqual([{ start: 1000, end: 1023 }]);
	});

	it('adds a range dragged right to left', () => {
		expect(addRange([{ start: 0, end: 10 }], { start: 30, end: 20 }, 64)).toEqual([
			{ start: 0, end: 10 },
			{ start: 20, end: 30 }
		]);
	});

	it('finds and removes the range under a channel', () => {
		const ranges = [{ start: 0, end: 10 }, { start: 20, end: 30 }];
		expect(findRangeAt(ranges, 25)).toBe(1);
		expect(findRangeAt(ranges, 15)).toBe(-1);
		expect(findRangeAt(ranges, 10)).toBe(0);
		expect(removeRangeAt(ranges, 20)).toEqual([{ start: 0, end: 10 }]);
		expect(removeRangeAt(ranges, 15)).toEqual(ranges);
	});

	it('subtracts a range, splitting one that contains it', () => {
		expect(subtractRange([{ start: 0, end: 100 }], { start: 40, end: 60 })).toEqual([
			{ start: 0, end: 39 },
			{ start: 61, end: 100 }
		]);
		expect(subtractRange([{ start: 0, end: 10 }, { start: 20, end: 30 }], { start: 5, end: 25 })).toEqual([
			{ start: 0, end: 4 },
			{ start: 26, end: 30 }
		]);
	});
});

describe('parseRanges', () => {
	it('accepts hyphens, en dashes, spaces and single channels', () => {
		const parsed = parseRanges('100–400, 500-520 ,  612, 700 – 710; 9', 1024);
		expect(parsed).toEqual({
			ok: true,
			value: [
				{ start: 9, end: 9 },
				{ start: 100, end: 400 },
				{ start: 500, end: 520 },
				{ start: 612, end: 612 },
				{ start: 700, end: 710 }
			]
		});
	});

	it('reads empty text as no ranges', () => {
		expect(parseRanges('  ', 1024)).toEqual({ ok: true, value: [] });
	});

	it('names a token that is not a range', () => {
		const parsed = parseRanges('100-400, abc, 500-520', 1024);
		expect(parsed.ok).toBe(false);
		if (!parsed.ok) {
			expect(parsed.error.token).toBe('abc');
			expect(parsed.error.message).toContain('"abc"');
		}
	});

	it('rejects fractions and negative numbers with the token', () => {
		const fraction = parseRanges('10.5-20', 1024);
		expect(fraction.ok ? null : fraction.error.token).toBe('10.5-20');
		const negative = parseRanges('-5-10', 1024);
		expect(negative.ok ? null : negative.error.token).toBe('-5-10');
	});

	it('says how to fix a reversed range', () => {
		const parsed = parseRanges('400-100', 1024);
		expect(parsed.ok ? null : parsed.error.message).toContain('100–400');
	});

	it('rejects channels past the end of the window and names the last channel', () => {
		const parsed = parseRanges('1000-1024', 1024);
		expect(parsed.ok).toBe(false);
		if (!parsed.ok) {
			expect(parsed.error.token).toBe('1000-1024');
			expect(parsed.error.message).toContain('1023');
		}
	});

	it('reads back what formatRanges writes', () => {
		const ranges = [{ start: 3, end: 3 }, { start: 100, end: 400 }, { start: 500, end: 520 }];
		const text = formatRanges(ranges);
		expect(text).toBe('3, 100–400, 500–520');
		expect(parseRanges(text, 1024)).toEqual({ ok: true, value: ranges });
	});
});

describe('usable channels and bandwidth', () => {
	it('counts each channel once', () => {
		expect(countChannels([{ start: 0, end: 9 }, { start: 5, end: 14 }], 1024)).toBe(15);
	});

	it('subtracts excluded channels from the clean ranges and from the window', () => {
		// 1024 channels of 400 kHz (DESIGN.md demo-window shape); clean 100–199 (100 channels), excluded 150–159
		// (10 channels) and 1000–1023 (24 channels): 90 clean channels = 36 MHz; 990 window channels = 396 MHz.
		const summary = summariseChannels({
			nChan: 1024,
			chanWidthHz: 4e5,
			clean: [{ start: 100, end: 199 }],
			excluded: [{ start: 150, end: 159 }, { start: 1000, end: 1023 }]
		});
		expect(summary.clean.channels).toBe(90);
		expect(summary.clean.bandwidthHz).toBeCloseTo(36e6, 3);
		expect(summary.window.channels).toBe(990);
		expect(summary.window.bandwidthHz).toBeCloseTo(396e6, 3);
	});

	it('gives the whole band for a window with no exclusions', () => {
		// 200 MHz over 1024 channels is 195.3125 kHz per channel (METHODS.md §9 worked example).
		const summary = summariseChannels({ nChan: 1024, chanWidthHz: -195312.5, clean: [], excluded: [] });
		expect(summary.window.bandwidthHz).toBeCloseTo(200e6, 3);
		expect(summary.clean.channels).toBe(0);
	});

	it('describes a range by its channel-centre frequencies, lowest first', () => {
		// Channel c is at first + c·width: 1000 MHz + 10·0.4 MHz = 1004 MHz; + 19·0.4 = 1007.6 MHz.
		expect(describeRangeFrequency({ start: 10, end: 19 }, 1e9, 4e5)).toBe('1004.000–1007.600 MHz');
		// Downward window: 1500 MHz − 10·0.4 = 1496 MHz, − 19·0.4 = 1492.4 MHz.
		expect(describeRangeFrequency({ start: 10, end: 19 }, 1.5e9, -4e5)).toBe('1492.400–1496.000 MHz');
	});
});
