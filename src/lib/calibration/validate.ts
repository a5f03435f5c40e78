import type { ObservationSummary } from './observation-schema';
import type { RecipeParams } from './recipe';
import { makeErr, makeOk, type InputIssue, type Result } from './result';
import { convertZodIssues } from './issues';
import { buildRuleContext } from './rules/context';
import { RULES } from './rules/index';
import { rulePolicySchema, type Finding, type RulePolicy, type Severity } from './rules/types';

export { RULES } from './rules/index';
export { rulePolicySchema, type Finding, type RulePolicy, type Severity, type Rule } from './rules/types';

const RULES_BY_CODE = new Map(RULES.map((r) => [r.code, r]));

/** Check a recipe against the rules of the trade and, when given, its observation; a team policy may re-grade rules. */
export function validate(recipe: RecipeParams, observation?: ObservationSummary | null, policy?: RulePolicy | null): Finding[] {
	const ctx = buildRuleContext(recipe, observation ?? null);
	const findings: Finding[] = [];
	if (!observation) {
		findings.push({
			code: 'context.no_observation',
			severity: 'note',
			path: '',
			message: 'no observation summary given: checks that need scans, antennas or channels were skipped',
			why: 'Field names, scan lengths, the reference antenna, channel limits and SNR are all checked against the observation.',
			source: 'project choice'
		});
	}
	for (const rule of RULES) {
		const override = rule.locked ? undefined : policy?.overrides[rule.code];
		if (override === 'off') continue;
		const severity: Severity = override ?? rule.severity;
		for (const hit of rule.check(ctx)) {
			const finding: Finding = { code: rule.code, severity, path: hit.path, message: hit.message, why: hit.why ?? rule.why, source: rule.source };
			if (override && override !== rule.severity) finding.policy = { from: rule.severity, to: override };
			findings.push(finding);
		}
	}
	return findings;
}

/** Whether any finding blocks saving a version. */
export function hasErrors(findings: readonly Finding[]): boolean {
	return findings.some((f) => f.severity === 'error');
}

/** Parse a team rule policy: unknown rule codes and locked rules are reported, not silently ignored. */
export function parseRulePolicy(value: unknown): Result<RulePolicy, { issues: InputIssue[] }> {
	const parsed = rulePolicySchema.safeParse(value, { reportInput: true });
	if (!parsed.success) return makeErr({ issues: convertZodIssues(parsed.error.issues) });
	const issues: InputIssue[] = [];
	for (const code of Object.keys(parsed.data.overrides)) {
		const rule = RULES_BY_CODE.get(code);
		const path = `$.overrides[${JSON.stringify(code)}]`;
		if (!rule) issues.push({ path, message: `expected the code of a validation rule, found ${JSON.stringify(code)}` });
		else if (rule.locked) issues.push({ path, message: `rule ${code} guards what the program needs to run and cannot be changed by a policy` });
	}
	return issues.length > 0 ? makeErr({ issues }) : makeOk(parsed.data);
}
