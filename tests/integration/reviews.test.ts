import { later, setUpDemoTeams } from './fixtures';
import { describe, expect, it } from 'vitest';
import { eq, sql } from 'drizzle-orm';
import { inRollback } from './db';
import { addComment, decideReview, getReviewTimeline, listReviewActionsFor, listReviewQueue, submitForReview, withdrawFromReview } from '../../src/lib/server/services/reviews';
import { listAudit } from '../../src/lib/server/services/audit';
import { getRecipeVersion, insertRecipeVersion } from '../../src/lib/server/db/queries/recipes';
import { reviewEvents } from '../../src/lib/server/db/schema';
import type { Executor } from '../../src/lib/server/db/client';
import type { Finding } from '../../src/lib/calibration/validate';


async function setUp(tx: Executor) {
	const f = await setUpDemoTeams(tx);
	/** Saves the draft as the next version, authored by `userId`. */
	const saveAs = async (userId: string, message: string): Promise<{ id: string; version: number }> => {
		const v = await f.save(f.recipeId, userId, message);
		return { id: v.id, version: v.version };
	};
	return { ...f, saveAs };
}

describe('review workflow on real versions', () => {
	it('starts a saved version as a draft and records submit and request-changes in the timeline', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v1 = await saveAs(people.ada, 'first plan');
			const before = await getReviewTimeline(tx, v1.id);
			expect(before.ok && before.value.state).toBe('draft');

			const submitted = await submitForReview(tx, { versionId: v1.id, userId: people.ada, now: later(1) });
			expect(submitted.ok && submitted.value).toMatchObject({ from: 'draft', to: 'in_review' });
			const decided = await decideReview(tx, { versionId: v1.id, userId: people.ravi, decision: 'request_changes', note: 'Gain interval too short for the gain calibrator.', now: later(2) });
			expect(decided.ok && decided.value).toMatchObject({ from: 'in_review', to: 'changes_requested' });

			const timeline = await getReviewTimeline(tx, v1.id);
			if (!timeline.ok) throw new Error(timeline.error.message);
			expect(timeline.value.state).toBe('changes_requested');
			expect(timeline.value.events.map((e) => [e.action, e.from, e.to, e.actorId, e.at.toISOString()])).toEqual([
				['submit', 'draft', 'in_review', people.ada, later(1).toISOString()],
				['request_changes', 'in_review', 'changes_requested', people.ravi, later(2).toISOString()]
			]);
			expect(timeline.value.events[1]?.note).toBe('Gain interval too short for the gain calibrator.');
		});
	});

	it('lets a new version after changes requested be submitted and approved by a reviewer', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v1 = await saveAs(people.ada, 'v1');
			await submitForReview(tx, { versionId: v1.id, userId: people.ada, now: later(1) });
			await decideReview(tx, { versionId: v1.id, userId: people.ravi, decision: 'request_changes', now: later(2) });
			const v2 = await saveAs(people.ada, 'v2 with the changes');
			expect((await submitForReview(tx, { versionId: v2.id, userId: people.ada, now: later(3) })).ok).toBe(true);
			const approved = await decideReview(tx, { versionId: v2.id, userId: people.lena, decision: 'approve', now: later(4) });
			expect(approved.ok && approved.value.to).toBe('approved');
			// The first version keeps its own outcome.
			const t1 = await getReviewTimeline(tx, v1.id);
			expect(t1.ok && t1.value.state).toBe('changes_requested');
		});
	});

	it('rejects approval by the version\'s author, even a reviewer', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v = await saveAs(people.ravi, 'saved by the reviewer');
			await submitForReview(tx, { versionId: v.id, userId: people.ravi });
			const r = await decideReview(tx, { versionId: v.id, userId: people.ravi, decision: 'approve' });
			expect(r.ok ? null : r.error.code).toBe('forbidden');
			expect(r.ok ? '' : r.error.message).toMatch(/cannot approve a version you saved yourself/);
			const t = await getReviewTimeline(tx, v.id);
			expect(t.ok && t.value.state).toBe('in_review');
		});
	});

	it('refuses decisions by members and by people of another team, per role', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v = await saveAs(people.lena, 'saved by the lead');
			// Submitting: members of the team yes, other teams no.
			const foreign = await submitForReview(tx, { versionId: v.id, userId: people.ines });
			expect(foreign.ok ? null : foreign.error.code).toBe('forbidden');
			expect((await submitForReview(tx, { versionId: v.id, userId: people.ada })).ok).toBe(true);
			// Deciding: the member and another team's lead are refused; the reviewer may.
			for (const who of [people.ada, people.tomas, people.ines]) {
				const r = await decideReview(tx, { versionId: v.id, userId: who, decision: 'request_changes' });
				expect(r.ok ? null : r.error.code).toBe('forbidden');
			}
			expect(await listReviewActionsFor(tx, { versionId: v.id, userId: people.ada })).toEqual([]);
			expect(await listReviewActionsFor(tx, { versionId: v.id, userId: people.lena })).toEqual(['request_changes', 'withdraw']);
			expect(await listReviewActionsFor(tx, { versionId: v.id, userId: people.ravi })).toEqual(['approve', 'request_changes']);
			expect((await decideReview(tx, { versionId: v.id, userId: people.ravi, decision: 'approve' })).ok).toBe(true);
		});
	});

	it('refuses moves the state machine does not allow and explains them', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v = await saveAs(people.ada, 'v1');
			const early = await decideReview(tx, { versionId: v.id, userId: people.ravi, decision: 'approve' });
			expect(early.ok ? null : early.error).toMatchObject({ code: 'conflict', message: expect.stringMatching(/Submit it for review first/) });
			await submitForReview(tx, { versionId: v.id, userId: people.ada });
			const twice = await submitForReview(tx, { versionId: v.id, userId: people.ada });
			expect(twice.ok ? null : twice.error.code).toBe('conflict');
			const notAuthor = await withdrawFromReview(tx, { versionId: v.id, userId: people.lena });
			expect(notAuthor.ok ? null : notAuthor.error.code).toBe('forbidden');
			expect((await withdrawFromReview(tx, { versionId: v.id, userId: people.ada })).ok).toBe(true);
			await submitForReview(tx, { versionId: v.id, userId: people.ada });
			await decideReview(tx, { versionId: v.id, userId: people.ravi, decision: 'approve' });
			const again = await decideReview(tx, { versionId: v.id, userId: people.lena, decision: 'request_changes' });
			expect(again.ok ? null : again.error.message).toMatch(/approved version is final/);
			// Refused moves leave no event: submit, withdraw, submit, approve.
			const t = await getReviewTimeline(tx, v.id);
			expect(t.ok && t.value.events.map((e) => e.action)).toEqual(['submit', 'withdraw', 'submit', 'approve']);
		});
	});

	it('refuses to approve a version whose stored findings contain an error', async () => {
		await inRollback(async (tx) => {
			const { people, recipeId, saveAs } = await setUp(tx);
			await saveAs(people.ada, 'v1');
			const v1 = await getRecipeVersion(tx, recipeId, 1);
			if (!v1) throw new Error('no v1');
			const error: Finding = { code: 'refant.unknown', severity: 'error', path: 'reference_antenna.primary', message: 'No antenna named X99.', why: 'The solver needs a reference antenna that exists.', source: 'common practice' };
			const { id: _id, authorEmail: _a, createdAt: _c, ...copy } = v1;
			const { id } = await insertRecipeVersion(tx, { ...copy, version: 2, findings: [...v1.findings, error], message: 'inserted with an error finding', authorId: people.ada });
			expect((await submitForReview(tx, { versionId: id, userId: people.ada })).ok).toBe(true);
			const r = await decideReview(tx, { versionId: id, userId: people.ravi, decision: 'approve' });
			expect(r.ok ? null : r.error).toMatchObject({ code: 'conflict', message: expect.stringMatching(/error findings/) });
			expect((await decideReview(tx, { versionId: id, userId: people.ravi, decision: 'request_changes' })).ok).toBe(true);
		});
	});

	it('writes an audit entry for every state change, and keeps events immutable', async () => {
		await inRollback(async (tx) => {
			const { team, people, saveAs } = await setUp(tx);
			const v = await saveAs(people.ada, 'v1');
			await submitForReview(tx, { versionId: v.id, userId: people.ada });
			await decideReview(tx, { versionId: v.id, userId: people.ravi, decision: 'approve' });
			const audit = await listAudit(tx, team.id);
			// Only the review entries: saving the version wrote its own audit entries before.
			expect(audit.ok && audit.value.items.filter((a) => a.action.startsWith('review.')).map((a) => [a.action, a.subjectId, a.actorId])).toEqual([
				['review.approve', v.id, people.ravi],
				['review.submit', v.id, people.ada]
			]);
			await tx.execute(sql`savepoint ev`);
			const err = await tx.update(reviewEvents).set({ note: 'rewritten' }).where(eq(reviewEvents.recipeVersionId, v.id)).then(() => null, (e: { cause?: Error }) => e);
			expect(String(err?.cause?.message)).toMatch(/review_events rows are immutable/);
			await tx.execute(sql`rollback to savepoint ev`);
		});
	});

	it('pages through the audit log with a cursor', async () => {
		await inRollback(async (tx) => {
			const { team, people, saveAs } = await setUp(tx);
			const v = await saveAs(people.ada, 'v1');
			await submitForReview(tx, { versionId: v.id, userId: people.ada });
			await withdrawFromReview(tx, { versionId: v.id, userId: people.ada });
			await submitForReview(tx, { versionId: v.id, userId: people.ada });
			const first = await listAudit(tx, team.id, { limit: 2 });
			if (!first.ok) throw new Error(first.error.message);
			expect(first.value.items.map((a) => a.action)).toEqual(['review.submit', 'review.withdraw']);
			const second = await listAudit(tx, team.id, { limit: 2, cursor: first.value.nextCursor });
			// Then the older entries written when the recipe was created and its version saved.
			expect(second.ok && second.value.items.map((a) => a.action)).toEqual(['review.submit', 'version.save']);
			const third = await listAudit(tx, team.id, { limit: 2, cursor: second.ok ? second.value.nextCursor : null });
			expect(third.ok && third.value.items.map((a) => a.action)).toEqual(['recipe.create']);
			expect(third.ok && third.value.nextCursor).toBeNull();
			const bad = await listAudit(tx, team.id, { cursor: 'not-a-cursor' });
			expect(bad.ok ? null : bad.error.code).toBe('validation_failed');
		});
	});
});

describe('review comments', () => {
	it('stores comments on the whole version and on a program line, in the timeline', async () => {
		await inRollback(async (tx) => {
			const { people, saveAs } = await setUp(tx);
			const v = await saveAs(people.ada, 'v1');
			expect((await addComment(tx, { versionId: v.id, userId: people.ravi, body: 'Looks sensible overall.', now: later(1) })).ok).toBe(true);
			expect((await addComment(tx, { versionId: v.id, userId: people.lena, body: 'Why 60 s here?', programLine: 12, now: later(2) })).ok).toBe(true);
			const t = await getReviewTimeline(tx, v.id);
			expect(t.ok && t.value.comments.map((c) => [c.authorId, c.programLine, c.body])).toEqual([
				[people.ravi, null, 'Looks sensible overall.'],
				[people.lena, 12, 'Why 60 s here?']
			]);
		});
	});

	it('rejects empty, over-long, off-program and foreign comments with the reason', async () => {
		await inRollback(async (tx) => {
			const { people, recipeId, saveAs } = await setUp(tx);
			const v = await saveAs(people.ada, 'v1');
			const row = await getRecipeVersion(tx, recipeId, 1);
			const lines = (row?.program ?? '').split('\n').length;
			const empty = await addComment(tx, { versionId: v.id, userId: people.ravi, body: '   ' });
			expect(empty.ok ? null : empty.error.message).toMatch(/empty/);
			// The limit of 5000 characters is the one issue 6 sets (project choice).
			const long = await addComment(tx, { versionId: v.id, userId: people.ravi, body: 'x'.repeat(5001) });
			expect(long.ok ? null : long.error.message).toMatch(/5001 characters long; the limit is 5000/);
			expect((await addComment(tx, { versionId: v.id, userId: people.ravi, body: 'y'.repeat(5000) })).ok).toBe(true);
			const offProgram = await addComment(tx, { versionId: v.id, userId: people.ravi, body: 'here', programLine: lines + 5 });
			expect(offProgram.ok ? null : offProgram.error.message).toMatch(/is not in the program of version 1/);
			const foreign = await addComment(tx, { versionId: v.id, userId: people.ines, body: 'drive-by' });
			expect(foreign.ok ? null : foreign.error.code).toBe('forbidden');
		});
	});
});

describe('review queue', () => {
	it('lists the versions in review of the given teams only', async () => {
		await inRollback(async (tx) => {
			const { team, other, people, recipeId, saveAs } = await setUp(tx);
			const v1 = await saveAs(people.ada, 'v1');
			const v2 = await saveAs(people.ada, 'v2');
			await saveAs(people.ada, 'v3 stays a draft');
			await submitForReview(tx, { versionId: v1.id, userId: people.ada, now: later(1) });
			await submitForReview(tx, { versionId: v2.id, userId: people.ada, now: later(2) });
			await decideReview(tx, { versionId: v1.id, userId: people.ravi, decision: 'approve', now: later(3) });
			const queue = await listReviewQueue(tx, [team.id]);
			expect(queue.map((q) => [q.recipeId, q.version, q.authorEmail])).toEqual([[recipeId, 2, 'ada@stellar-nurseries.example']]);
			expect(await listReviewQueue(tx, [other.id])).toEqual([]);
			expect(await listReviewQueue(tx, [])).toEqual([]);
		});
	});
});
