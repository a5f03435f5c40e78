import { describe, expect, it } from 'vitest';
import { programFilename } from './filename';

describe('programFilename', () => {
	it('makes a lower-case ASCII slug with the version', () => {
		expect(programFilename('Corrie Flats L-band, session 1 (demo)', 3)).toBe('corrie-flats-l-band-session-1-demo-v3.py');
	});
	it('drops accents, quotes and path separators so the header stays safe', () => {
		expect(programFilename('Tomás "x"/../\\evil\r\n', 1)).toBe('tomas-x-evil-v1.py');
	});
	it('falls back to a generic name when nothing usable is left', () => {
		expect(programFilename('✨✨', 2)).toBe('calibration-v2.py');
	});
});
