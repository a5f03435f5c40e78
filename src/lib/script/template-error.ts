/** What went wrong while compiling or rendering a template set. */
export type TemplateErrorKind =
	| 'missing_entry'
	| 'syntax'
	| 'raw_output'
	| 'unquoted_output'
	| 'unknown_helper'
	| 'forbidden_construct'
	| 'missing_partial'
	| 'missing_field'
	| 'bad_value';

/** Where in a template file; `line` is 1-based, `column` 1-based, either may be unknown. */
export type TemplateLocation = { file: string | null; line: number | null; column: number | null };

/**
 * A template that cannot be compiled or rendered. The message names the file and,
 * when Handlebars or our checks know it, the line, then says what to change.
 */
export class TemplateError extends Error {
	readonly kind: TemplateErrorKind;
	readonly file: string | null;
	readonly line: number | null;
	readonly column: number | null;
	readonly reason: string;

	constructor(kind: TemplateErrorKind, reason: string, where: Partial<TemplateLocation> = {}) {
		const file = where.file ?? null;
		const line = where.line ?? null;
		const column = where.column ?? null;
		super(`${formatLocation({ file, line, column })}${reason}`);
		this.name = 'TemplateError';
		this.kind = kind;
		this.file = file;
		this.line = line;
		this.column = column;
		this.reason = reason;
	}

	/** The same error placed in `file` (kept if a location is already known). */
	withFile(file: string): TemplateError {
		if (this.file !== null) return this;
		return new TemplateError(this.kind, this.reason, { file, line: this.line, column: this.column });
	}
}

function formatLocation(where: TemplateLocation): string {
	const parts: string[] = [];
	if (where.file !== null) parts.push(`templates/${where.file}`);
	if (where.line !== null) parts.push(`line ${where.line}${where.column !== null ? `, column ${where.column}` : ''}`);
	return parts.length > 0 ? `${parts.join(' ')}: ` : '';
}
