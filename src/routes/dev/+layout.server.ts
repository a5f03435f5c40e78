import { error } from '@sveltejs/kit';
import type { LayoutServerLoad } from './$types';
import { usesFakeMail } from '$lib/server/mail/transport';

// The development mailbox exists only while mail goes to the local fake server.
export const load: LayoutServerLoad = () => {
	if (!usesFakeMail()) error(404, { message: 'Not found', code: 'not_found' });
};
