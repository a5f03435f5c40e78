import type { ParamMatcher } from '@sveltejs/kit';
import { WIZARD_STEPS } from '$lib/workflow/wizard/steps';

const steps: ReadonlySet<string> = new Set(WIZARD_STEPS);

export const match: ParamMatcher = (param) => steps.has(param);
