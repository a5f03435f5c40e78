import { describe, expect, it } from 'vitest';
import { describeAuditEntry } from './describe-audit';

// The audit log's wording, checked against entries shaped as the services record them
// (services/reviews.ts, recipes.ts, sharing.ts, forks.ts, template-editing.ts).
const RECIPE = '11111111-2222-4333-8444-555555555555';
const VERSION_ROW = '66666666-7777-4888-8999-000000000000';

describe('describeAuditEntry', () => {
	it('names a review decision and the states in plain words, linking the version', () => {
		const d = describeAuditEntry({ action: 'review.request_changes', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipeId: RECIPE, version: 2, from: 'in_review', to: 'changes_requested' } });
		expect(d.what).toBe('Asked for changes to a version');
		expect(d.subject).toEqual({ text: 'Recipe version 2', href: `/recipes/${RECIPE}/versions/2` });
		expect(d.details).toBe('From in review to changes requested.');
	});

	it('says where a comment is anchored', () => {
		expect(describeAuditEntry({ action: 'review.comment', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipeId: RECIPE, version: 1, programLine: 42 } }).details).toBe('On line 42 of the program.');
		expect(describeAuditEntry({ action: 'review.comment', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipeId: RECIPE, version: 1, programLine: null } }).details).toBe('On the whole version.');
	});

	it('reads both spellings of the recipe key on saved versions and quotes the message', () => {
		const d = describeAuditEntry({ action: 'version.save', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipe_id: RECIPE, version: 3, message: 'Shorter gain interval', template: 'standard@1' } });
		expect(d.subject.href).toBe(`/recipes/${RECIPE}/versions/3`);
		expect(d.details).toBe('Message: “Shorter gain interval”. Rendered with template standard version 1.');
	});

	it('describes a move to another template version', () => {
		const d = describeAuditEntry({ action: 'version.save', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipeId: RECIPE, version: 4, templateMoved: { from: { name: 'standard', version: 1 }, to: { name: 'survey', version: 2 } } } });
		expect(d.details).toBe('Moved from template standard version 1 to survey version 2.');
	});

	it('links a template version through the lookup it is given, and has no link without one', () => {
		const entry = { action: 'template.version', subjectType: 'template_version', subjectId: VERSION_ROW, details: { name: 'survey', version: 2, sha256: 'ab'.repeat(32), pythonCheck: 'passed' } };
		const linked = describeAuditEntry(entry, (id) => (id === VERSION_ROW ? '/templates/t/versions/2' : null));
		expect(linked.subject).toEqual({ text: 'Template survey version 2', href: '/templates/t/versions/2' });
		expect(linked.details).toBe(`SHA-256 ${'ab'.repeat(8)}…. Python's parser accepted the demo program.`);
		expect(describeAuditEntry(entry).subject.href).toBeNull();
	});

	it('shares and forks name the recipe and the copied version', () => {
		expect(describeAuditEntry({ action: 'recipe.share', subjectType: 'recipe', subjectId: RECIPE, details: { title: 'Session 1', latestVersion: 2 } })).toEqual({
			what: 'Shared a recipe with all teams',
			subject: { text: 'Recipe “Session 1”', href: `/recipes/${RECIPE}` },
			details: 'Its newest version was then version 2.'
		});
		expect(describeAuditEntry({ action: 'recipe.forked_by_other_team', subjectType: 'recipe', subjectId: RECIPE, details: { sourceVersion: 5 } }).details).toBe('They copied version 5.');
	});

	it('falls back to the raw action and simple fields for an action it does not know, ignoring nested values', () => {
		const d = describeAuditEntry({ action: 'team.rename', subjectType: 'team', subjectId: RECIPE, details: { to: 'Nurseries', count: 2, nested: { a: 1 } } });
		expect(d).toEqual({ what: 'team.rename', subject: { text: 'team 11111111', href: null }, details: 'to: Nurseries; count: 2' });
	});

	it('survives details of the wrong types without throwing', () => {
		const d = describeAuditEntry({ action: 'review.approve', subjectType: 'recipe_version', subjectId: VERSION_ROW, details: { recipeId: 7, version: 'two', from: null } });
		expect(d.subject).toEqual({ text: 'A recipe version', href: null });
		expect(d.details).toBe('From unknown to unknown.');
	});
});
