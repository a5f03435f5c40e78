import { error, redirect } from '@sveltejs/kit';
import { fail, message, setError, superValidate, type SuperValidated } from 'sveltekit-superforms';
import { zod4 } from 'sveltekit-superforms/adapters';
import type { Actions, PageServerLoad } from './$types';
import { getDb } from '$lib/server/db/client';
import { getObservation, listObservations } from '$lib/server/db/queries/observations';
import { getRulePolicy } from '$lib/server/db/queries/teams';
import { loadRecipeFor } from '$lib/server/services/recipe-access';
import { statusFor } from '$lib/server/http';
import { changeObservation, saveDraft, saveVersion } from '$lib/server/services/recipes';
import { renderWithTemplate } from '$lib/server/services/render';
import { ensureStarterTemplates } from '$lib/server/services/templates';
import { validate, type Finding } from '$lib/calibration/validate';
import type { ObservationSummary } from '$lib/calibration/observation';
import type { RecipeParams } from '$lib/calibration/recipe';
import { nextStep, previousStep, type WizardStep } from '$lib/workflow/wizard/steps';
import {
	applyChannelsForm,
	applyFluxForm,
	applyReferenceForm,
	applyRolesForm,
	applySolveForm,
	channelsFormSchema,
	channelsFormValues,
	fluxFormSchema,
	fluxFormValues,
	observationFormSchema,
	referenceFormSchema,
	referenceFormValues,
	rolesFormSchema,
	rolesFormValues,
	saveVersionFormSchema,
	solveFormSchema,
	solveFormValues,
	type FormResult
} from '$lib/workflow/wizard/forms';
import { z } from 'zod';

const reviewFormSchema = saveVersionFormSchema.extend({ title: z.string().trim().min(1, 'Give the recipe a title.').max(200), notes: z.string().max(5000).default('') });

export type StepForm =
	| { step: 'observation'; form: SuperValidated<z.infer<typeof observationFormSchema>> }
	| { step: 'roles'; form: SuperValidated<z.infer<typeof rolesFormSchema>> }
	| { step: 'flux'; form: SuperValidated<z.infer<typeof fluxFormSchema>> }
	| { step: 'reference'; form: SuperValidated<z.infer<typeof referenceFormSchema>> }
	| { step: 'channels'; form: SuperValidated<z.infer<typeof channelsFormSchema>> }
	| { step: 'solve'; form: SuperValidated<z.infer<typeof solveFormSchema>> }
	| { step: 'review'; form: SuperValidated<z.infer<typeof reviewFormSchema>> };

export type WizardPageData = StepForm & {
	recipe: { id: string; title: string; revision: number; teamId: string };
	draft: RecipeParams;
	observation: { id: string; name: string; summary: ObservationSummary } | null;
	observations: { id: string; name: string; array: string }[];
	findings: Finding[];
	program: { text: string; sha256: string } | null;
	previous: WizardStep | null;
	next: WizardStep | null;
};

async function buildForm(step: WizardStep, draft: RecipeParams, summary: ObservationSummary | null, revision: number, observationId: string | null): Promise<StepForm> {
	const s = summary;
	switch (step) {
		case 'observation':
			return { step, form: await superValidate({ revision, observation_id: observationId ?? '' }, zod4(observationFormSchema), { errors: false }) };
		case 'roles':
			return { step, form: await superValidate({ revision, ...(s ? rolesFormValues(draft, s) : { assignments: [], target_gcal: [], target_interp: [] }) }, zod4(rolesFormSchema)) };
		case 'flux':
			return { step, form: await superValidate({ revision, ...fluxFormValues(draft) }, zod4(fluxFormSchema)) };
		case 'reference':
			return { step, form: await superValidate({ revision, ...referenceFormValues(draft) }, zod4(referenceFormSchema)) };
		case 'channels':
			return { step, form: await superValidate({ revision, ...channelsFormValues(draft) }, zod4(channelsFormSchema)) };
		case 'solve':
			return { step, form: await superValidate({ revision, ...solveFormValues(draft) }, zod4(solveFormSchema)) };
		case 'review':
			return { step, form: await superValidate({ revision, message: '', title: draft.title, notes: draft.notes }, zod4(reviewFormSchema), { errors: false }) };
	}
}

export const load: PageServerLoad = async (event): Promise<WizardPageData> => {
	const { recipe } = await loadRecipeFor(event, event.params.recipeId, 'recipe.edit');
	const step = event.params.step as WizardStep;
	const obs = recipe.observationId ? await getObservation(getDb(), recipe.observationId) : null;
	const summary = obs?.summary ?? null;
	if (!summary && step !== 'observation') redirect(303, `/recipes/${recipe.id}/edit/observation`);
	const findings = validate(recipe.draft, summary, await getRulePolicy(getDb(), recipe.teamId));
	let program: WizardPageData['program'] = null;
	if (step === 'review') {
		const template = await ensureStarterTemplates(getDb());
		const r = renderWithTemplate({ template, recipe: recipe.draft, observation: summary, recipeId: recipe.id, recipeVersion: 0 });
		program = r.ok ? { text: r.value.program, sha256: r.value.sha256 } : null;
	}
	const observations = step === 'observation' ? (await listObservations(getDb(), recipe.teamId)).map((o) => ({ id: o.id, name: o.name, array: o.summary.array.name })) : [];
	return {
		...(await buildForm(step, recipe.draft, summary, recipe.draftRevision, recipe.observationId)),
		recipe: { id: recipe.id, title: recipe.title, revision: recipe.draftRevision, teamId: recipe.teamId },
		draft: recipe.draft,
		observation: obs ? { id: obs.id, name: obs.name, summary: obs.summary } : null,
		observations,
		findings,
		program,
		previous: previousStep(step),
		next: nextStep(step)
	};
};

/** Saves a screen's result as the new draft and moves on; form errors and conflicts stay on the screen. */
async function finishStep<T extends { revision: number }>(
	form: SuperValidated<T>,
	result: FormResult,
	ctx: { recipeId: string; userId: string; now: Date; dest: string }
) {
	if (!result.ok) {
		for (const issue of result.issues) setError(form, issue.field as never, issue.message);
		return message(form, { kind: 'problem', text: result.issues.map((i) => i.message).join(' ') }, { status: 400 });
	}
	const saved = await saveDraft(getDb(), { recipeId: ctx.recipeId, baseRevision: form.data.revision, params: result.draft, userId: ctx.userId, now: ctx.now });
	if (!saved.ok) return message(form, { kind: saved.error.code === 'conflict' ? 'conflict' : 'problem', text: saved.error.message }, { status: statusFor(saved.error.code) });
	redirect(303, ctx.dest);
}

function target(recipeId: string, step: WizardStep, go: string | null): string {
	const dest = go === 'back' ? previousStep(step) : go === 'stay' ? step : (nextStep(step) ?? step);
	return `/recipes/${recipeId}/edit/${dest ?? step}`;
}

export const actions: Actions = {
	save: async (event) => {
		const { recipe, user } = await loadRecipeFor(event, event.params.recipeId, 'recipe.edit');
		const step = event.params.step as WizardStep;
		const formData = await event.request.formData();
		const go = typeof formData.get('go') === 'string' ? String(formData.get('go')) : null;
		const obs = recipe.observationId ? await getObservation(getDb(), recipe.observationId) : null;
		const summary = obs?.summary ?? null;
		const nChan = summary?.spectral_windows.find((w) => w.id === recipe.draft.spectral_window_id)?.n_chan ?? 0;
		const now = new Date();

		if (step === 'observation') {
			const form = await superValidate(formData, zod4(observationFormSchema));
			if (!form.valid) return fail(400, { form });
			const r = await changeObservation(getDb(), { recipeId: recipe.id, observationId: form.data.observation_id, baseRevision: form.data.revision, userId: user.id, now });
			if (!r.ok) return message(form, { kind: r.error.code === 'conflict' ? 'conflict' : 'problem', text: r.error.message }, { status: statusFor(r.error.code) });
			redirect(303, target(recipe.id, step, go));
		}
		if (step === 'review') {
			const form = await superValidate(formData, zod4(reviewFormSchema));
			if (!form.valid) return fail(400, { form });
			const params = { ...recipe.draft, title: form.data.title, notes: form.data.notes };
			const r = await saveVersion(getDb(), { recipeId: recipe.id, userId: user.id, message: form.data.message, params, baseRevision: form.data.revision, now });
			if (!r.ok) {
				// Keep the edited title and notes as the draft even when the version is refused.
				if (r.error.code === 'validation_failed') await saveDraft(getDb(), { recipeId: recipe.id, baseRevision: form.data.revision, params, userId: user.id, now });
				return message(form, { kind: r.error.code === 'conflict' ? 'conflict' : 'problem', text: r.error.message, issues: r.error.issues ?? [] }, { status: statusFor(r.error.code) });
			}
			redirect(303, `/recipes/${recipe.id}/versions/${r.value.version}`);
		}
		if (!summary) error(409, { message: 'Choose an observation first.', code: 'conflict' });

		const ctx = { recipeId: recipe.id, draft: recipe.draft, userId: user.id, now, dest: target(recipe.id, step, go) };
		switch (step) {
			case 'roles': {
				const f = await superValidate(formData, zod4(rolesFormSchema));
				return f.valid ? finishStep(f, applyRolesForm(recipe.draft, summary, f.data), ctx) : fail(400, { form: f });
			}
			case 'flux': {
				const f = await superValidate(formData, zod4(fluxFormSchema));
				return f.valid ? finishStep(f, applyFluxForm(recipe.draft, f.data), ctx) : fail(400, { form: f });
			}
			case 'reference': {
				const f = await superValidate(formData, zod4(referenceFormSchema));
				return f.valid ? finishStep(f, applyReferenceForm(recipe.draft, f.data), ctx) : fail(400, { form: f });
			}
			case 'channels': {
				const f = await superValidate(formData, zod4(channelsFormSchema));
				return f.valid ? finishStep(f, applyChannelsForm(recipe.draft, nChan, f.data), ctx) : fail(400, { form: f });
			}
			case 'solve': {
				const f = await superValidate(formData, zod4(solveFormSchema));
				return f.valid ? finishStep(f, applySolveForm(recipe.draft, f.data), ctx) : fail(400, { form: f });
			}
		}
	}
};
