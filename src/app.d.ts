import type { SessionUser } from '$lib/server/db/queries/users';
import type { ErrorCode } from '$lib/workflow/errors';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
		}
		interface Error {
			message: string;
			code?: ErrorCode;
			errorId?: string;
		}
	}
}

export {};
