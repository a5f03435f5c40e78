import type { Executor } from './client';
import type { DomainResult } from '$lib/workflow/errors';

// Drizzle commits a transaction whose callback returns normally, even with a failed
// result; rolling back needs a throw. This is the one place that does it.
class RolledBack<T> extends Error {
	constructor(readonly result: T) {
		super('rolled back');
	}
}

/**
 * Runs `fn` in one transaction that commits only when it returns an ok result: a failed
 * result rolls back whatever `fn` wrote before it found the problem (e.g. a copied observation).
 */
export async function inResultTransaction<T>(db: Executor, fn: (tx: Executor) => Promise<DomainResult<T>>): Promise<DomainResult<T>> {
	try {
		return await db.transaction(async (tx) => {
			const r = await fn(tx);
			if (!r.ok) throw new RolledBack(r);
			return r;
		});
	} catch (e) {
		if (e instanceof RolledBack) return e.result as DomainResult<T>;
		throw e;
	}
}
