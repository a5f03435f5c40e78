import { error, isHttpError, json, type RequestEvent } from '@sveltejs/kit';
import type { z } from 'zod';
import type { DomainError, ErrorCode } from '$lib/workflow/errors';

/** The single map from error code to HTTP status. */
export function statusFor(code: ErrorCode): 400 | 401 | 403 | 404 | 409 | 500 {
	switch (code) {
		case 'validation_failed':
			return 400;
		case 'unauthenticated':
			return 401;
		case 'forbidden':
			return 403;
		case 'not_found':
			return 404;
		case 'conflict':
			return 409;
		case 'internal':
			return 500;
	}
}

function codeForStatus(status: number): ErrorCode {
	if (status === 400 || status === 413 || status === 415) return 'validation_failed';
	if (status === 401) return 'unauthenticated';
	if (status === 403) return 'forbidden';
	if (status === 404) return 'not_found';
	if (status === 409) return 'conflict';
	return 'internal';
}

/** A JSON error reply in the one shape every API route uses. */
export function apiError(e: DomainError, status: number = statusFor(e.code)): Response {
	return json({ error: e }, { status });
}

/** Throws (as a page or API error) for a failed domain operation. */
export function throwDomainError(e: DomainError): never {
	error(statusFor(e.code), { message: e.message, code: e.code });
}

/** A form post's text fields as a plain object (file fields become ''), ready for a zod schema. */
export async function readFormFields(request: Request): Promise<Record<string, string>> {
	const form = await request.formData();
	return Object.fromEntries([...form.entries()].map(([k, v]) => [k, typeof v === 'string' ? v : '']));
}

export const MAX_JSON_BODY_BYTES = 6 * 1024 * 1024;

/** Reads and validates a JSON body; throws a 400 with issues when it does not fit. */
export async function readJson<S extends z.ZodType>(request: Request, schema: S): Promise<z.infer<S>> {
	const type = request.headers.get('content-type') ?? '';
	if (!type.includes('application/json')) {
		error(415, { message: 'Send the body as JSON with Content-Type: application/json.', code: 'validation_failed' });
	}
	const text = await request.text();
	if (text.length > MAX_JSON_BODY_BYTES) {
		error(413, { message: `The body is larger than ${MAX_JSON_BODY_BYTES} bytes.`, code: 'validation_failed' });
	}
	let value: unknown;
	try {
		value = JSON.parse(text);
	} catch (e) {
		error(400, { message: `The body is not valid JSON: ${(e as Error).message}`, code: 'validation_failed' });
	}
	const parsed = schema.safeParse(value);
	if (!parsed.success) {
		const issues = parsed.error.issues.map((i) => ({ path: ['$', ...i.path.map(String)].join('.'), message: i.message }));
		throw new ApiValidationError(issues);
	}
	return parsed.data;
}

export class ApiValidationError extends Error {
	constructor(readonly issues: { path: string; message: string }[]) {
		super('The request body does not match what this endpoint expects.');
	}
}

/**
 * Wraps an API handler so every failure leaves as `{ error: { code, message, issues? } }`
 * with the right status, never an HTML page or a stack trace.
 */
export function apiHandler<E extends RequestEvent>(fn: (event: E) => Promise<Response>): (event: E) => Promise<Response> {
	return async (event) => {
		try {
			return await fn(event);
		} catch (e) {
			if (e instanceof ApiValidationError) return apiError({ code: 'validation_failed', message: e.message, issues: e.issues });
			if (isHttpError(e)) {
				const body = e.body as { message?: string; code?: ErrorCode };
				return apiError({ code: body.code ?? codeForStatus(e.status), message: body.message ?? 'Request failed.' }, e.status);
			}
			throw e;
		}
	};
}
