/** Outcome of a domain operation that can fail for expected reasons (STYLE.md §5). */
export type Result<T, E> = { ok: true; value: T } | { ok: false; error: E };

/** Wrap a success value. */
export function makeOk<T>(value: T): { ok: true; value: T } {
	return { ok: true, value };
}

/** Wrap an expected failure. */
export function makeErr<E>(error: E): { ok: false; error: E } {
	return { ok: false, error };
}

/** One problem in an input document: where (`$.scans[3].field_id`) and what. */
export type InputIssue = { path: string; message: string };
