import type { TeamRole } from '$lib/workflow/permissions';

export type MeResponse = {
	id: string;
	email: string;
	name: string | null;
	isAdmin: boolean;
	teams: { id: string; name: string; role: TeamRole }[];
};
