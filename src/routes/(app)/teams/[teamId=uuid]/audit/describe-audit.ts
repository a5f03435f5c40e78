// Turns one stored audit entry into plain words for the team's audit log page. Pure: the
// page passes in what it looked up (where a template version's page is).

export type AuditEntryInput = { action: string; subjectType: string; subjectId: string; details: Record<string, unknown> };

export type AuditDescription = {
	/** What was done, e.g. "Approved a version". */
	what: string;
	/** What it was done to, with the page that shows it when there is one. */
	subject: { text: string; href: string | null };
	/** The details in a sentence; empty when there is nothing more to say. */
	details: string;
};

const STATE_WORDS: Record<string, string> = { draft: 'draft', in_review: 'in review', approved: 'approved', changes_requested: 'changes requested' };

const REVIEW_WHAT: Record<string, string> = {
	submit: 'Submitted a version for review',
	approve: 'Approved a version',
	request_changes: 'Asked for changes to a version',
	withdraw: 'Took a version out of review'
};

function readText(details: Record<string, unknown>, key: string): string | null {
	const v = details[key];
	return typeof v === 'string' && v.trim() !== '' ? v : null;
}

function readNumber(details: Record<string, unknown>, key: string): number | null {
	const v = details[key];
	return typeof v === 'number' && Number.isFinite(v) ? v : null;
}

function readRecord(details: Record<string, unknown>, key: string): Record<string, unknown> | null {
	const v = details[key];
	return typeof v === 'object' && v !== null && !Array.isArray(v) ? (v as Record<string, unknown>) : null;
}

function describeTemplateRef(ref: Record<string, unknown> | null): string | null {
	if (!ref) return null;
	const name = readText(ref, 'name');
	const version = readNumber(ref, 'version');
	return name && version !== null ? `${name} version ${version}` : null;
}

function describeState(state: string | null): string {
	return state === null ? 'unknown' : (STATE_WORDS[state] ?? state);
}

function quote(text: string, max = 160): string {
	const chars = [...text.replace(/\s+/g, ' ').trim()];
	return `“${chars.slice(0, max).join('')}${chars.length > max ? '…' : ''}”`;
}

function describeRecipe(entry: AuditEntryInput): AuditDescription['subject'] {
	const title = readText(entry.details, 'title');
	return { text: title ? `Recipe ${quote(title, 80)}` : 'Recipe', href: `/recipes/${entry.subjectId}` };
}

function describeRecipeVersion(entry: AuditEntryInput): AuditDescription['subject'] {
	// Older entries spell the recipe key recipe_id; newer ones recipeId.
	const recipeId = readText(entry.details, 'recipeId') ?? readText(entry.details, 'recipe_id');
	const version = readNumber(entry.details, 'version');
	if (recipeId && version !== null) return { text: `Recipe version ${version}`, href: `/recipes/${recipeId}/versions/${version}` };
	return { text: 'A recipe version', href: null };
}

/** Everything not known by name, as "key: value" pairs of its simple fields. */
function describeOtherDetails(details: Record<string, unknown>): string {
	return Object.entries(details)
		.filter(([, v]) => typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean')
		.map(([k, v]) => `${k}: ${String(v)}`)
		.join('; ');
}

/** Plain-words description of one audit entry; `templateHref` gives a template version's page by its id. */
export function describeAuditEntry(entry: AuditEntryInput, templateHref: (templateVersionId: string) => string | null = () => null): AuditDescription {
	const d = entry.details;
	const [area, verb = ''] = entry.action.split('.', 2);
	if (area === 'review') {
		const what = verb === 'comment' ? 'Commented on a version' : (REVIEW_WHAT[verb] ?? `Review action “${verb}”`);
		const line = readNumber(d, 'programLine');
		const details =
			verb === 'comment'
				? line !== null ? `On line ${line} of the program.` : 'On the whole version.'
				: `From ${describeState(readText(d, 'from'))} to ${describeState(readText(d, 'to'))}.`;
		return { what, subject: describeRecipeVersion(entry), details };
	}
	switch (entry.action) {
		case 'recipe.create': {
			const obs = readText(d, 'observation');
			return { what: 'Created a recipe', subject: describeRecipe(entry), details: obs ? `For the observation ${quote(obs, 80)}.` : '' };
		}
		case 'recipe.import': {
			const file = readText(d, 'file');
			return { what: 'Imported a recipe from a file', subject: describeRecipe(entry), details: file ? `From the file ${quote(file, 80)}.` : '' };
		}
		case 'recipe.share': {
			const latest = readNumber(d, 'latestVersion');
			return { what: 'Shared a recipe with all teams', subject: describeRecipe(entry), details: latest !== null ? `Its newest version was then version ${latest}.` : '' };
		}
		case 'recipe.unshare':
			return { what: 'Withdrew a shared recipe', subject: describeRecipe(entry), details: '' };
		case 'recipe.fork': {
			const v = readNumber(d, 'sourceVersion');
			return { what: 'Forked a shared recipe into this team', subject: { text: 'The new fork', href: `/recipes/${entry.subjectId}` }, details: v !== null ? `Copied from version ${v} of the shared recipe.` : '' };
		}
		case 'recipe.forked_by_other_team': {
			const v = readNumber(d, 'sourceVersion');
			return { what: 'Another team forked a recipe of this team', subject: describeRecipe(entry), details: v !== null ? `They copied version ${v}.` : '' };
		}
		case 'version.save': {
			const moved = readRecord(d, 'templateMoved');
			const message = readText(d, 'message');
			const parts: string[] = [];
			if (moved) parts.push(`Moved from template ${describeTemplateRef(readRecord(moved, 'from')) ?? 'unknown'} to ${describeTemplateRef(readRecord(moved, 'to')) ?? 'unknown'}.`);
			if (message) parts.push(`Message: ${quote(message)}.`);
			const template = readText(d, 'template');
			if (template && !moved) parts.push(`Rendered with template ${template.replace('@', ' version ')}.`);
			return { what: 'Saved a recipe version', subject: describeRecipeVersion(entry), details: parts.join(' ') };
		}
		case 'template.create': {
			const name = readText(d, 'name') ?? 'a template';
			const from = describeTemplateRef(readRecord(d, 'copiedFrom'));
			return { what: 'Started a team template', subject: { text: `Template ${name} version 1`, href: templateHref(entry.subjectId) }, details: from ? `A copy of the starter set ${from}.` : '' };
		}
		case 'template.version': {
			const name = readText(d, 'name') ?? 'a template';
			const version = readNumber(d, 'version');
			const sha = readText(d, 'sha256');
			const check = readText(d, 'pythonCheck');
			const checkWords = check === 'passed' ? "Python's parser accepted the demo program." : check === 'skipped' ? 'The Python check could not be run on the server and was skipped.' : '';
			return {
				what: 'Saved a new template version',
				subject: { text: `Template ${name}${version !== null ? ` version ${version}` : ''}`, href: templateHref(entry.subjectId) },
				details: [sha ? `SHA-256 ${sha.slice(0, 16)}….` : '', checkWords].filter((s) => s !== '').join(' ')
			};
		}
		default:
			return { what: entry.action, subject: { text: `${entry.subjectType.replace(/_/g, ' ')} ${entry.subjectId.slice(0, 8)}`, href: null }, details: describeOtherDetails(d) };
	}
}
