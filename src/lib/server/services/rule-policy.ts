import type { Executor } from '../db/client';
import { setRulePolicy } from '../db/queries/teams';
import { parseRulePolicy, type RulePolicy } from '$lib/calibration/validate';
import { fail, type DomainResult } from '$lib/workflow/errors';

/** Replaces a team's rule policy after checking every code against the rule registry. */
export async function updateRulePolicy(db: Executor, teamId: string, value: unknown): Promise<DomainResult<RulePolicy>> {
	const parsed = parseRulePolicy(value);
	if (!parsed.ok) return fail('validation_failed', 'The rule policy names unknown or locked rules.', parsed.error.issues);
	await setRulePolicy(db, teamId, parsed.value);
	return { ok: true, value: parsed.value };
}
