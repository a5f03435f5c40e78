import type { LayoutServerLoad } from './$types';
import { requirePageUser } from '$lib/server/guards';
import { usesFakeMail } from '$lib/server/mail/transport';

export type ShellData = {
	user: { id: string; email: string; name: string | null; isAdmin: boolean };
	teams: { id: string; name: string; role: 'member' | 'reviewer' | 'lead' }[];
	mailbox: boolean;
};

export const load: LayoutServerLoad = (event): ShellData => {
	const user = requirePageUser(event);
	return {
		user: { id: user.id, email: user.email, name: user.name, isAdmin: user.isAdmin },
		teams: user.memberships.map((m) => ({ id: m.teamId, name: m.teamName, role: m.role })),
		mailbox: usesFakeMail()
	};
};
