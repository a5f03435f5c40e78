import type { PageServerLoad } from './$types';
import { usesFakeMail } from '$lib/server/mail/transport';

export const load: PageServerLoad = (): { mailbox: boolean } => ({ mailbox: usesFakeMail() });
