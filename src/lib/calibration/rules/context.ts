import type { ObservationSummary, Scan } from '../observation-schema';
import { scanDurationS } from '../observation';
import type { FieldRole } from '../field-role';
import type { RecipeParams, Step, StepKind } from '../recipe';
import type { RuleContext } from './types';

/** Derive the shared facts for one validation run. */
export function buildRuleContext(recipe: RecipeParams, observation: ObservationSummary | null): RuleContext {
	const rolesByField = new Map<string, Set<FieldRole>>();
	for (const f of recipe.fields) {
		const set = rolesByField.get(f.name) ?? new Set<FieldRole>();
		for (const r of f.roles) set.add(r);
		rolesByField.set(f.name, set);
	}
	const stepsByKind = new Map<StepKind, { step: Step; index: number }[]>();
	recipe.steps.forEach((step, index) => {
		const list = stepsByKind.get(step.kind) ?? [];
		list.push({ step, index });
		stepsByKind.set(step.kind, list);
	});
	const spw = observation?.spectral_windows.find((w) => w.id === recipe.spectral_window_id) ?? null;
	const fieldsByName = new Map(observation?.fields.map((f) => [f.name, f]) ?? []);
	const nameById = new Map(observation?.fields.map((f) => [f.id, f.name]) ?? []);
	const scansByField = new Map<string, { scan: ObservationSummary['scans'][number]; durationS: number }[]>();
	for (const scan of observation?.scans ?? []) {
		const name = nameById.get(scan.field_id);
		if (name === undefined || !scan.spw_ids.includes(recipe.spectral_window_id)) continue;
		const list = scansByField.get(name) ?? [];
		list.push({ scan, durationS: scanDurationS(scan) });
		scansByField.set(name, list);
	}
	return { recipe, observation, spw, rolesByField, fieldsByName, scansByField, stepsByKind };
}

/** Whether a field holds a role in the recipe. */
export function hasRole(ctx: RuleContext, field: string, role: FieldRole): boolean {
	return ctx.rolesByField.get(field)?.has(role) ?? false;
}

/** Names of the recipe's fields that hold a role. */
export function listFieldsWithRole(ctx: RuleContext, role: FieldRole): string[] {
	return [...ctx.rolesByField].filter(([, roles]) => roles.has(role)).map(([name]) => name);
}

/** Longest and shortest scan of a field in the recipe's window, seconds (null when it has none). */
export function getScanSpan(ctx: RuleContext, field: string): { longest: number; shortest: number } | null {
	const scans = ctx.scansByField.get(field);
	if (!scans || scans.length === 0) return null;
	const d = scans.map((s) => s.durationS);
	return { longest: Math.max(...d), shortest: Math.min(...d) };
}

/**
 * Whether an antenna has data in a scan. Summary v1 lists no per-scan antennas, so an antenna in
 * `flagged_antennas` counts as absent from every scan; a per-scan `antennas` list, if a later format adds one,
 * is honoured here first.
 */
export function isAntennaInScan(ctx: RuleContext, antenna: string, scan: Scan): boolean {
	if (ctx.observation?.flagged_antennas.includes(antenna)) return false;
	const perScan = (scan as { antennas?: unknown }).antennas;
	return Array.isArray(perScan) ? perScan.includes(antenna) : true;
}
