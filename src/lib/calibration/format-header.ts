import type { InputIssue } from './result';
import { describeValue } from './issues';

/**
 * Check `format` / `format_version` before the schema runs, so an unknown or newer file gets one clear
 * message instead of a list of unrelated schema complaints.
 */
export function checkFormatHeader(value: unknown, format: string, supportedVersion: number): InputIssue | null {
	if (typeof value !== 'object' || value === null || Array.isArray(value)) {
		return { path: '$', message: `expected a JSON object with "format": "${format}", found ${describeValue(value)}` };
	}
	const header = value as Record<string, unknown>;
	if (header.format !== format) {
		return {
			path: '$.format',
			message: `expected "${format}", found ${describeValue(header.format)}: this file is not a Phasewright ${format.replace('phasewright.', '')} file`
		};
	}
	const version = header.format_version;
	if (typeof version !== 'number' || !Number.isInteger(version) || version < 1) {
		return { path: '$.format_version', message: `expected a positive integer, found ${describeValue(version)}` };
	}
	if (version > supportedVersion) {
		return {
			path: '$.format_version',
			message: `this file is ${format} version ${version}, newer than the version this Phasewright reads (${supportedVersion}); update Phasewright or export the file as version ${supportedVersion}`
		};
	}
	return null;
}

/** Parse JSON text with a size limit and a nesting-depth limit; never throws. */
export function parseJsonText(
	text: string,
	limits: { maxBytes: number; maxDepth: number }
): { ok: true; value: unknown } | { ok: false; issue: InputIssue } {
	// UTF-16 length is a lower bound on the UTF-8 size and cheap; exact bytes matter little at this scale.
	if (text.length > limits.maxBytes) {
		return {
			ok: false,
			issue: { path: '$', message: `the file is larger than the limit of ${limits.maxBytes / 1e6} MB (found ${(text.length / 1e6).toFixed(1)} MB)` }
		};
	}
	const depth = measureJsonDepth(text);
	if (depth > limits.maxDepth) {
		return { ok: false, issue: { path: '$', message: `expected JSON nested at most ${limits.maxDepth} levels deep, found ${depth} levels` } };
	}
	try {
		return { ok: true, value: JSON.parse(text) };
	} catch (cause) {
		const detail = cause instanceof Error ? cause.message : 'unreadable';
		return { ok: false, issue: { path: '$', message: `expected valid JSON, found a syntax error (${detail})` } };
	}
}

/** Maximum bracket depth, ignoring brackets inside strings. */
function measureJsonDepth(text: string): number {
	let depth = 0;
	let max = 0;
	let inString = false;
	for (let i = 0; i < text.length; i++) {
		const c = text.charCodeAt(i);
		if (inString) {
			if (c === 92) i++; // backslash: skip the escaped character
			else if (c === 34) inString = false;
		} else if (c === 34) inString = true;
		else if (c === 123 || c === 91) {
			depth++;
			if (depth > max) max = depth;
		} else if (c === 125 || c === 93) depth--;
	}
	return max;
}
