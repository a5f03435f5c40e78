import type { FieldRole } from '$lib/calibration/field-role';
import type { ObservationField, Scan } from '$lib/calibration/observation-schema';
import { describeRoles, pickLeadingRole, ROLE_PRIORITY, type RoleKey } from './role-palette';

export type TimelineRowBy = 'field' | 'role';

export type TimelineInput = {
	scans: readonly Scan[];
	fields: readonly ObservationField[];
	/** Roles per field name (the recipe's `fields`); null or empty before roles are set. */
	roles?: readonly { name: string; roles: readonly FieldRole[] }[] | null;
	/** Drawing width of the time axis in px (the label column is not included). */
	width: number;
	rowHeight?: number;
	rowGap?: number;
	/** Fewest pixels between tick marks. */
	minTickSpacing?: number;
	rowBy?: TimelineRowBy;
};

export type TimelineRect = {
	scanId: number;
	field: string;
	roleKey: RoleKey;
	rolesText: string;
	row: number;
	x: number;
	y: number;
	width: number;
	height: number;
	startMs: number;
	endMs: number;
	durationS: number;
};

export type TimelineRow = { key: string; label: string; detail: string; roleKey: RoleKey; y: number };
export type TimelineTick = { x: number; timeMs: number; label: string };

export type TimelineLayout = {
	rects: TimelineRect[];
	rows: TimelineRow[];
	ticks: TimelineTick[];
	tickStepMin: number;
	spanStartMs: number;
	spanEndMs: number;
	width: number;
	height: number;
};

const MINUTE_MS = 60_000;
/** Tick steps in minutes; each divides a day, so ticks fall on round UTC times (10/15/30/60 min as asked, plus finer and coarser ones). */
export const TICK_STEPS_MIN = [1, 2, 5, 10, 15, 30, 60, 120, 180, 360, 720, 1440] as const;

/** Pick the smallest tick step that keeps ticks at least `minSpacingPx` apart. */
export function chooseTickStepMin(spanMs: number, width: number, minSpacingPx: number): number {
	const pxPerMin = (width * MINUTE_MS) / Math.max(spanMs, 1);
	for (const step of TICK_STEPS_MIN) if (step * pxPerMin >= minSpacingPx) return step;
	return TICK_STEPS_MIN[TICK_STEPS_MIN.length - 1] ?? 1440;
}

/** "HH:MM" in UTC. */
export function formatUtcClock(ms: number): string {
	const d = new Date(ms);
	return `${String(d.getUTCHours()).padStart(2, '0')}:${String(d.getUTCMinutes()).padStart(2, '0')}`;
}

/** A duration in words: "45 s", "10 min", "2 min 30 s", "1 h 05 min". */
export function formatDuration(seconds: number): string {
	const whole = Math.round(seconds);
	if (whole < 60) return `${whole} s`;
	if (whole < 3600) {
		const m = Math.floor(whole / 60);
		const s = whole - 60 * m;
		return s === 0 ? `${m} min` : `${m} min ${s} s`;
	}
	const totalMin = Math.round(whole / 60);
	const h = Math.floor(totalMin / 60);
	return `${h} h ${String(totalMin - 60 * h).padStart(2, '0')} min`;
}

/** Tick marks at multiples of the step (in UTC) inside the span. */
export function computeTimeTicks(spanStartMs: number, spanEndMs: number, width: number, minSpacingPx: number): { stepMin: number; ticks: TimelineTick[] } {
	const span = Math.max(spanEndMs - spanStartMs, 1);
	const stepMin = chooseTickStepMin(span, width, minSpacingPx);
	const stepMs = stepMin * MINUTE_MS;
	const ticks: TimelineTick[] = [];
	for (let t = Math.ceil(spanStartMs / stepMs) * stepMs; t <= spanEndMs; t += stepMs) {
		ticks.push({ x: ((t - spanStartMs) / span) * width, timeMs: t, label: formatUtcClock(t) });
	}
	return { stepMin, ticks };
}

/** Lay scans out as rectangles: x from UTC over the observation span, one row per field (or per role), width ≥ 1 px. */
export function layoutTimeline(input: TimelineInput): TimelineLayout {
	const { width } = input;
	const rowHeight = input.rowHeight ?? 18;
	const rowGap = input.rowGap ?? 6;
	const rowBy = input.rowBy ?? 'field';
	const rolesByName = new Map((input.roles ?? []).map((f) => [f.name, f.roles]));
	const fieldById = new Map(input.fields.map((f) => [f.id, f]));

	const timed = input.scans.map((scan) => ({ scan, startMs: Date.parse(scan.start_utc), endMs: Date.parse(scan.end_utc) }));
	const spanStartMs = Math.min(...timed.map((t) => t.startMs));
	const spanEndMs = Math.max(...timed.map((t) => t.endMs));
	if (timed.length === 0 || !Number.isFinite(spanStartMs) || !Number.isFinite(spanEndMs)) {
		return { rects: [], rows: [], ticks: [], tickStepMin: 0, spanStartMs: 0, spanEndMs: 0, width, height: 0 };
	}
	const span = Math.max(spanEndMs - spanStartMs, 1);

	// Rows: fields that have scans, ordered by leading role then by first appearance; or one row per leading role.
	const seen = new Set<number>();
	const observedFields: ObservationField[] = [];
	for (const t of timed) {
		const field = fieldById.get(t.scan.field_id);
		if (field && !seen.has(field.id)) {
			seen.add(field.id);
			observedFields.push(field);
		}
	}
	const roleRank = (key: RoleKey) => (key === 'unassigned' ? ROLE_PRIORITY.length : ROLE_PRIORITY.indexOf(key));
	const rowKeyOf = (field: ObservationField) => (rowBy === 'field' ? `field:${field.id}` : `role:${pickLeadingRole(rolesByName.get(field.name))}`);
	const rowSpecs = new Map<string, { label: string; detail: string; roleKey: RoleKey; order: number }>();
	observedFields.forEach((field, i) => {
		const roleKey = pickLeadingRole(rolesByName.get(field.name));
		const key = rowKeyOf(field);
		const existing = rowSpecs.get(key);
		if (rowBy === 'field') {
			rowSpecs.set(key, { label: field.name, detail: describeRoles(rolesByName.get(field.name)), roleKey, order: roleRank(roleKey) * 10_000 + i });
		} else if (existing) {
			existing.detail = `${existing.detail}, ${field.name}`;
		} else {
			rowSpecs.set(key, { label: describeRoles(roleKey === 'unassigned' ? [] : [roleKey]), detail: field.name, roleKey, order: roleRank(roleKey) });
		}
	});
	const orderedKeys = [...rowSpecs.entries()].sort((a, b) => a[1].order - b[1].order).map(([k]) => k);
	const rowIndex = new Map(orderedKeys.map((k, i) => [k, i]));
	const rows: TimelineRow[] = orderedKeys.map((key, i) => {
		const spec = rowSpecs.get(key);
		return { key, label: spec?.label ?? key, detail: spec?.detail ?? '', roleKey: spec?.roleKey ?? 'unassigned', y: i * (rowHeight + rowGap) };
	});

	const rects: TimelineRect[] = [];
	for (const t of timed) {
		const field = fieldById.get(t.scan.field_id);
		if (!field) continue;
		const row = rowIndex.get(rowKeyOf(field)) ?? 0;
		const x0 = ((t.startMs - spanStartMs) / span) * width;
		const w = Math.max(1, ((t.endMs - t.startMs) / span) * width);
		// A widened sliver must still end inside the strip.
		const x = Math.min(x0, width - w);
		rects.push({
			scanId: t.scan.id,
			field: field.name,
			roleKey: pickLeadingRole(rolesByName.get(field.name)),
			rolesText: describeRoles(rolesByName.get(field.name)),
			row,
			x,
			y: row * (rowHeight + rowGap),
			width: w,
			height: rowHeight,
			startMs: t.startMs,
			endMs: t.endMs,
			durationS: (t.endMs - t.startMs) / 1000
		});
	}
	rects.sort((a, b) => a.startMs - b.startMs || a.scanId - b.scanId);
	const { stepMin, ticks } = computeTimeTicks(spanStartMs, spanEndMs, width, input.minTickSpacing ?? 60);
	const height = rows.length === 0 ? 0 : rows.length * rowHeight + (rows.length - 1) * rowGap;
	return { rects, rows, ticks, tickStepMin: stepMin, spanStartMs, spanEndMs, width, height };
}
