import type { SessionUser } from '$lib/server/db/queries/users';
import type { ErrorCode } from '$lib/workflow/errors';

declare global {
	namespace App {
		interface Locals {
			user: SessionUser | null;
		}
		namespace Superforms {
			type Message = { kind: 'problem' | 'conflict' | 'saved'; text: string; issues?: { path: string; message: string }[] };
		}
		interface Error {
			message: string;
			code?: ErrorCode;
			errorId?: string;
		}
	}
}

export {};
