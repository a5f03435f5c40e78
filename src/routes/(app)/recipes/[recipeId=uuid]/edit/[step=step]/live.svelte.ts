import type { Finding } from '$lib/calibration/validate';
import type { RecipeParams } from '$lib/calibration/recipe';
import { canonicalJson } from '$lib/script/canonical-json';
import type { ValidateResponse } from '../../../../../api/v1/validate/contract';
import type { RenderResponse } from '../../../../../api/v1/render/contract';
import type { SaveDraftResponse } from '../../../../../api/v1/recipes/[recipeId=uuid]/draft/contract';

/**
 * The wizard's live state in the browser: the draft as edited, its findings (from
 * /api/v1/validate, debounced, stale requests cancelled), the program preview (from
 * /api/v1/render) and autosave of the draft with the revision guard.
 */
export class WizardLive {
	findings = $state<Finding[]>([]);
	program = $state<{ text: string; sha256: string } | null>(null);
	checking = $state(false);
	revision = $state(1);
	saveState = $state<'saved' | 'saving' | 'unsaved' | 'conflict' | 'error'>('saved');
	saveMessage = $state('');
	lastUpdateMs = $state(0);

	#recipeId: string;
	#observationId: string | null;
	#withProgram: boolean;
	#checkTimer: ReturnType<typeof setTimeout> | undefined;
	#saveTimer: ReturnType<typeof setTimeout> | undefined;
	#controller: AbortController | null = null;
	#savedJson: string;
	#inFlight: Promise<void> | null = null;

	constructor(init: { recipeId: string; observationId: string | null; revision: number; findings: Finding[]; program: { text: string; sha256: string } | null; draft: RecipeParams; withProgram: boolean }) {
		this.#recipeId = init.recipeId;
		this.#observationId = init.observationId;
		this.#withProgram = init.withProgram;
		this.revision = init.revision;
		this.findings = init.findings;
		this.program = init.program;
		// Canonical JSON: the database hands the draft back with its keys in another order.
		this.#savedJson = canonicalJson(init.draft);
	}

	/** Called whenever the edited draft changes. */
	update(draft: RecipeParams): void {
		const json = canonicalJson(draft);
		if (json === this.#savedJson) return;
		clearTimeout(this.#checkTimer);
		// Short: the edit-to-findings budget is 150 ms (bench:web); stale requests are cancelled anyway.
		this.#checkTimer = setTimeout(() => void this.#check(draft), 40);
		if (this.saveState !== 'conflict') {
			this.saveState = 'unsaved';
			clearTimeout(this.#saveTimer);
			this.#saveTimer = setTimeout(() => {
				this.#inFlight = this.#autosave(draft, json).finally(() => (this.#inFlight = null));
			}, 1000);
		}
	}

	/** Stops a pending autosave: the form is being submitted, which saves the draft itself. */
	cancelAutosave(): void {
		clearTimeout(this.#saveTimer);
		clearTimeout(this.#checkTimer);
	}

	/** Resolves once an autosave already on its way has finished (its new revision is then known). */
	whenSaved(): Promise<void> {
		return this.#inFlight ?? Promise.resolve();
	}

	async #check(draft: RecipeParams): Promise<void> {
		this.#controller?.abort();
		const controller = new AbortController();
		this.#controller = controller;
		this.checking = true;
		const body = JSON.stringify({ recipe: draft, ...(this.#observationId ? { observation_id: this.#observationId } : {}) });
		const post = (url: string) => fetch(url, { method: 'POST', headers: { 'content-type': 'application/json' }, body, signal: controller.signal });
		try {
			const [v, r] = await Promise.all([post('/api/v1/validate'), this.#withProgram ? post('/api/v1/render') : Promise.resolve(null)]);
			if (v.ok) this.findings = ((await v.json()) as ValidateResponse).findings;
			if (r && r.ok) {
				const rendered = (await r.json()) as RenderResponse;
				this.program = { text: rendered.program, sha256: rendered.sha256 };
			}
			this.lastUpdateMs = performance.now();
		} catch (e) {
			if ((e as Error).name !== 'AbortError') this.saveMessage = `Live checks are unavailable: ${(e as Error).message}`;
		} finally {
			if (this.#controller === controller) this.checking = false;
		}
	}

	async #autosave(draft: RecipeParams, json: string): Promise<void> {
		this.saveState = 'saving';
		try {
			const res = await fetch(`/api/v1/recipes/${this.#recipeId}/draft`, {
				method: 'PUT',
				headers: { 'content-type': 'application/json' },
				body: JSON.stringify({ base_revision: this.revision, params: draft })
			});
			const body = (await res.json()) as SaveDraftResponse | { error: { code: string; message: string } };
			if ('revision' in body) {
				this.revision = body.revision;
				this.#savedJson = json;
				this.saveState = 'saved';
				this.saveMessage = '';
			} else {
				this.saveState = body.error.code === 'conflict' ? 'conflict' : 'error';
				this.saveMessage = body.error.message;
			}
		} catch (e) {
			this.saveState = 'error';
			this.saveMessage = `The draft could not be saved: ${(e as Error).message}`;
		}
	}
}
