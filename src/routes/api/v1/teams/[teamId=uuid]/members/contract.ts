import type { TeamRole } from '$lib/workflow/permissions';

export type MemberItem = { userId: string; email: string; name: string | null; role: TeamRole };
export type MembersResponse = { items: MemberItem[]; nextCursor: null };
