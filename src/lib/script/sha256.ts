/** SHA-256 digests (FIPS 180-4) of program text and of recipe parameters, as lowercase hex. */
import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex, utf8ToBytes } from '@noble/hashes/utils.js';
import type { RecipeParams } from '../calibration/recipe';
import { canonicalJson } from './canonical-json';

/** SHA-256 of a text's UTF-8 bytes, as 64 lowercase hex digits. */
export function textSha256(text: string): string {
	return bytesToHex(sha256(utf8ToBytes(text)));
}

/** SHA-256 of the canonical JSON of recipe parameters: equal parameters give equal digests whatever their key order. */
export function paramsSha256(recipe: RecipeParams): string {
	return textSha256(canonicalJson(recipe));
}
