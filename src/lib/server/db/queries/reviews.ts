import { and, asc, eq, inArray, sql } from 'drizzle-orm';
import type { Executor } from '../client';
import { recipes, recipeVersions, reviewComments, reviewEvents, teams, users, versionReviewStates } from '../schema';
import type { ReviewAction, ReviewState } from '$lib/workflow/review-state';
import type { Finding } from '$lib/calibration/validate';

/** A saved version with what review decisions need: its team, author, findings and program. */
export type ReviewSubject = {
	versionId: string;
	recipeId: string;
	recipeTitle: string;
	teamId: string;
	teamName: string;
	version: number;
	authorId: string | null;
	findings: Finding[];
	program: string;
	state: ReviewState;
};

/**
 * The version with its review state. With `forUpdate` the state row is created when missing
 * and locked, so concurrent decisions on one version run one after the other.
 */
export async function getReviewSubject(db: Executor, versionId: string, forUpdate = false): Promise<ReviewSubject | null> {
	if (forUpdate) {
		const exists = await db.select({ id: recipeVersions.id }).from(recipeVersions).where(eq(recipeVersions.id, versionId)).limit(1);
		if (exists.length === 0) return null;
		await db.insert(versionReviewStates).values({ recipeVersionId: versionId }).onConflictDoNothing();
		// Locked on its own: FOR UPDATE cannot reach the nullable side of the outer join below.
		await db.select({ id: versionReviewStates.recipeVersionId }).from(versionReviewStates).where(eq(versionReviewStates.recipeVersionId, versionId)).for('update');
	}
	const rows = await db
		.select({
			versionId: recipeVersions.id,
			recipeId: recipeVersions.recipeId,
			recipeTitle: recipes.title,
			teamId: recipes.teamId,
			teamName: teams.name,
			version: recipeVersions.version,
			authorId: recipeVersions.authorId,
			findings: recipeVersions.findings,
			program: recipeVersions.program,
			state: sql<ReviewState>`coalesce(${versionReviewStates.state}, 'draft')`
		})
		.from(recipeVersions)
		.innerJoin(recipes, eq(recipes.id, recipeVersions.recipeId))
		.innerJoin(teams, eq(teams.id, recipes.teamId))
		.leftJoin(versionReviewStates, eq(versionReviewStates.recipeVersionId, recipeVersions.id))
		.where(eq(recipeVersions.id, versionId))
		.limit(1);
	return rows[0] ?? null;
}

export async function setReviewState(db: Executor, versionId: string, state: ReviewState, now: Date): Promise<void> {
	await db
		.insert(versionReviewStates)
		.values({ recipeVersionId: versionId, state, updatedAt: now })
		.onConflictDoUpdate({ target: versionReviewStates.recipeVersionId, set: { state, updatedAt: now } });
}

export async function insertReviewEvent(
	db: Executor,
	e: { versionId: string; action: ReviewAction; from: ReviewState; to: ReviewState; actorId: string; note: string | null; now: Date }
): Promise<{ id: string }> {
	const [row] = await db
		.insert(reviewEvents)
		.values({ recipeVersionId: e.versionId, action: e.action, fromState: e.from, toState: e.to, actorId: e.actorId, note: e.note, createdAt: e.now })
		.returning({ id: reviewEvents.id });
	if (!row) throw new Error('insert into review_events returned no row');
	return row;
}

export async function insertReviewComment(db: Executor, c: { versionId: string; authorId: string; body: string; programLine: number | null; now: Date }): Promise<{ id: string }> {
	const [row] = await db
		.insert(reviewComments)
		.values({ recipeVersionId: c.versionId, authorId: c.authorId, body: c.body, programLine: c.programLine, createdAt: c.now })
		.returning({ id: reviewComments.id });
	if (!row) throw new Error('insert into review_comments returned no row');
	return row;
}

export type ReviewEventRow = { id: string; action: ReviewAction; from: ReviewState; to: ReviewState; actorId: string | null; actorEmail: string | null; actorName: string | null; note: string | null; at: Date };
export type ReviewCommentRow = { id: string; authorId: string | null; authorEmail: string | null; authorName: string | null; body: string; programLine: number | null; at: Date };

export async function listReviewEvents(db: Executor, versionId: string): Promise<ReviewEventRow[]> {
	return db
		.select({
			id: reviewEvents.id,
			action: reviewEvents.action,
			from: reviewEvents.fromState,
			to: reviewEvents.toState,
			actorId: reviewEvents.actorId,
			actorEmail: users.email,
			actorName: users.name,
			note: reviewEvents.note,
			at: reviewEvents.createdAt
		})
		.from(reviewEvents)
		.leftJoin(users, eq(users.id, reviewEvents.actorId))
		.where(eq(reviewEvents.recipeVersionId, versionId))
		.orderBy(asc(reviewEvents.createdAt), asc(reviewEvents.id));
}

export async function listReviewComments(db: Executor, versionId: string): Promise<ReviewCommentRow[]> {
	return db
		.select({
			id: reviewComments.id,
			authorId: reviewComments.authorId,
			authorEmail: users.email,
			authorName: users.name,
			body: reviewComments.body,
			programLine: reviewComments.programLine,
			at: reviewComments.createdAt
		})
		.from(reviewComments)
		.leftJoin(users, eq(users.id, reviewComments.authorId))
		.where(eq(reviewComments.recipeVersionId, versionId))
		.orderBy(asc(reviewComments.createdAt), asc(reviewComments.id));
}

/** Everyone who has commented on the version so far. */
export async function listCommenterIds(db: Executor, versionId: string): Promise<string[]> {
	const rows = await db
		.selectDistinct({ id: reviewComments.authorId })
		.from(reviewComments)
		.where(eq(reviewComments.recipeVersionId, versionId));
	return rows.flatMap((r) => (r.id ? [r.id] : []));
}

export type ReviewQueueItem = {
	versionId: string;
	recipeId: string;
	recipeTitle: string;
	teamId: string;
	teamName: string;
	version: number;
	authorEmail: string | null;
	submittedAt: Date;
};

/** Versions of the given teams that wait in review, longest-waiting first. */
export async function listVersionsInReview(db: Executor, teamIds: readonly string[]): Promise<ReviewQueueItem[]> {
	if (teamIds.length === 0) return [];
	return db
		.select({
			versionId: recipeVersions.id,
			recipeId: recipes.id,
			recipeTitle: recipes.title,
			teamId: recipes.teamId,
			teamName: teams.name,
			version: recipeVersions.version,
			authorEmail: users.email,
			submittedAt: versionReviewStates.updatedAt
		})
		.from(versionReviewStates)
		.innerJoin(recipeVersions, eq(recipeVersions.id, versionReviewStates.recipeVersionId))
		.innerJoin(recipes, eq(recipes.id, recipeVersions.recipeId))
		.innerJoin(teams, eq(teams.id, recipes.teamId))
		.leftJoin(users, eq(users.id, recipeVersions.authorId))
		.where(and(eq(versionReviewStates.state, 'in_review'), inArray(recipes.teamId, [...teamIds])))
		.orderBy(asc(versionReviewStates.updatedAt), asc(recipeVersions.id));
}

/** Review state of every version of a recipe (versions without a state row are drafts). */
export async function listVersionStates(db: Executor, recipeId: string): Promise<{ versionId: string; version: number; state: ReviewState }[]> {
	return db
		.select({
			versionId: recipeVersions.id,
			version: recipeVersions.version,
			state: sql<ReviewState>`coalesce(${versionReviewStates.state}, 'draft')`
		})
		.from(recipeVersions)
		.leftJoin(versionReviewStates, eq(versionReviewStates.recipeVersionId, recipeVersions.id))
		.where(eq(recipeVersions.recipeId, recipeId))
		.orderBy(asc(recipeVersions.version));
}
