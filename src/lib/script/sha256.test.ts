import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import type { RecipeParams } from '../calibration/recipe';
import { paramsSha256, textSha256 } from './sha256';

function referenceSha256(text: string): string {
	return createHash('sha256').update(text, 'utf8').digest('hex');
}

function makeRecipe(): RecipeParams {
	return {
		schema_version: 1, title: 'Demo', notes: '', spectral_window_id: 0,
		fields: [{ name: 'CAL', roles: ['flux_calibrator'] }], flux_models: [], flux_estimates: [], targets: [],
		reference_antenna: { primary: 'A01', fallbacks: [] }, clean_channels: [], excluded_channels: [], steps: []
	};
}

describe('textSha256', () => {
	it('matches the FIPS 180-2 example vectors', () => {
		// NIST FIPS 180-2, Appendix B.1 (one-block message "abc").
		expect(textSha256('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
		// NIST FIPS 180-2, Appendix B.2 (multi-block message).
		expect(textSha256('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
			'248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1'
		);
		// NIST FIPS 180-2, Appendix B.3 (one million "a").
		expect(textSha256('a'.repeat(1_000_000))).toBe('cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0');
	});

	it('matches the empty-message vector', () => {
		// NIST CAVP SHAVS test vectors, SHA256ShortMsg.rsp, Len = 0.
		expect(textSha256('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
	});

	it('hashes the UTF-8 bytes of non-ASCII text, like Node’s crypto', () => {
		for (const text of ['ça va', '中文', '😀 𝄞', 'line\nbreak\u2028']) expect(textSha256(text)).toBe(referenceSha256(text));
	});
});

describe('paramsSha256', () => {
	it('is the SHA-256 of the canonical JSON, whatever the key order', () => {
		const recipe = makeRecipe();
		const reordered = Object.fromEntries(Object.entries(recipe).reverse()) as RecipeParams;
		const canonical =
			'{"clean_channels":[],"excluded_channels":[],"fields":[{"name":"CAL","roles":["flux_calibrator"]}],"flux_estimates":[],"flux_models":[],"notes":"","reference_antenna":{"fallbacks":[],"primary":"A01"},"schema_version":1,"spectral_window_id":0,"steps":[],"targets":[],"title":"Demo"}';
		expect(paramsSha256(recipe)).toBe(referenceSha256(canonical));
		expect(paramsSha256(reordered)).toBe(paramsSha256(recipe));
	});

	it('changes when any parameter changes', () => {
		const changed = { ...makeRecipe(), spectral_window_id: 1 };
		expect(paramsSha256(changed)).not.toBe(paramsSha256(makeRecipe()));
	});
});
