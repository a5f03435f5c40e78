import type { RecipeParams } from '$lib/calibration/recipe';
import type { ObservationSummary } from '$lib/calibration/observation';
import { buildRenderContext } from '$lib/script/render-context';
import { compileTemplateSet, type CompiledTemplateSet } from '$lib/script/render';
import { textSha256 } from '$lib/script/sha256';
import { TemplateError } from '$lib/script/template-error';
import { fail, type DomainResult } from '$lib/workflow/errors';
import type { TemplateVersion } from '../db/queries/templates';

// Template versions are immutable, so a compiled set can be kept by its content hash.
const compiled = new Map<string, CompiledTemplateSet>();
const MAX_CACHED = 32;

export type RenderedProgram = { program: string; sha256: string; template: { name: string; version: number; sha256: string } };

/** Renders a recipe with one stored template version; template problems are reported, not thrown. */
export function renderWithTemplate(input: {
	template: TemplateVersion;
	recipe: RecipeParams;
	observation: ObservationSummary | null;
	recipeId: string;
	recipeVersion: number;
}): DomainResult<RenderedProgram> {
	let set = compiled.get(input.template.sha256);
	if (!set) {
		const c = compileTemplateSet(input.template.files);
		if (!c.ok) return fail('internal', `Template ${input.template.templateName}@${input.template.version} does not compile: ${c.error.message}`);
		set = c.value;
		if (compiled.size >= MAX_CACHED) compiled.clear();
		compiled.set(input.template.sha256, set);
	}
	try {
		const program = set.render(
			buildRenderContext({
				recipe: input.recipe,
				observation: input.observation,
				recipeId: input.recipeId,
				recipeVersion: input.recipeVersion,
				templateName: input.template.templateName,
				templateVersion: input.template.version
			})
		);
		return { ok: true, value: { program, sha256: textSha256(program), template: { name: input.template.templateName, version: input.template.version, sha256: input.template.sha256 } } };
	} catch (e) {
		if (e instanceof TemplateError) return fail('validation_failed', `The recipe cannot be rendered with ${input.template.templateName}@${input.template.version}: ${e.message}`);
		throw e;
	}
}
