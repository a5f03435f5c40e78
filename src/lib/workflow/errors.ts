import type { Result } from '$lib/calibration/result';

// The error codes every failing operation maps to (STYLE.md §5); statusFor() in
// $lib/server/http.ts turns them into HTTP statuses.
export const ERROR_CODES = ['validation_failed', 'unauthenticated', 'forbidden', 'not_found', 'conflict', 'internal'] as const;
export type ErrorCode = (typeof ERROR_CODES)[number];

export type DomainError = { code: ErrorCode; message: string; issues?: { path: string; message: string }[] };

export type DomainResult<T> = Result<T, DomainError>;

/** Builds a failed result with the given code and message. */
export function fail(code: ErrorCode, message: string, issues?: DomainError['issues']): { ok: false; error: DomainError } {
	return { ok: false, error: issues ? { code, message, issues } : { code, message } };
}
