import { fail, redirect } from '@sveltejs/kit';
import type { Actions, PageServerLoad } from './$types';
import { signIn } from '$lib/server/auth';
import { getDb } from '$lib/server/db/client';
import { findUserByEmail } from '$lib/server/db/queries/users';
import { usesFakeMail } from '$lib/server/mail/transport';
import { signInInputSchema } from '$lib/workflow/team-schemas';

export const load: PageServerLoad = ({ locals, url }): { redirectTo: string; mailbox: boolean } => {
	const redirectTo = signInInputSchema.shape.redirectTo.parse(url.searchParams.get('redirectTo') ?? '/');
	if (locals.user) redirect(303, redirectTo);
	return { redirectTo, mailbox: usesFakeMail() };
};

export const actions: Actions = {
	requestLink: async (event) => {
		// Read a copy: Auth.js reads the original body itself.
		const form = await event.request.clone().formData();
		const parsed = signInInputSchema.safeParse({ email: form.get('email') ?? '', redirectTo: form.get('redirectTo') ?? '/' });
		const email = String(form.get('email') ?? '');
		if (!parsed.success) return fail(400, { email, message: parsed.error.issues[0]?.message ?? 'Check the address.' });
		if (!(await findUserByEmail(getDb(), parsed.data.email))) {
			return fail(400, {
				email,
				message: `No Phasewright account uses ${parsed.data.email}. Ask your team lead to add you, then try again.`
			});
		}
		await signIn(event);
	}
};
