import { z } from 'zod';
import { TEAM_ROLES } from './permissions';

// Inputs of team management, shared by the forms (client) and the services (server).
export const teamRoleSchema = z.enum(TEAM_ROLES, { message: 'Choose a role: member, reviewer or lead.' });

export const addMemberInputSchema = z.object({
	email: z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address, like name@example.org.' })),
	name: z.string().trim().max(120, 'Keep the name under 120 characters.').default(''),
	role: teamRoleSchema.default('member')
});
export type AddMemberInput = z.infer<typeof addMemberInputSchema>;

export const changeRoleInputSchema = z.object({
	userId: z.uuid({ message: 'Unknown member.' }),
	role: teamRoleSchema
});
export type ChangeRoleInput = z.infer<typeof changeRoleInputSchema>;

export const removeMemberInputSchema = z.object({ userId: z.uuid({ message: 'Unknown member.' }) });

export const createTeamInputSchema = z.object({
	name: z.string().trim().min(2, 'Give the team a name of at least 2 characters.').max(100, 'Keep the team name under 100 characters.'),
	slug: z
		.string()
		.trim()
		.regex(/^[a-z0-9]+(?:-[a-z0-9]+)*$/, 'Use lower-case letters, digits and single hyphens, e.g. "pulsar-timing".')
		.max(60),
	leadEmail: z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter the first lead\'s e-mail address.' }))
});
export type CreateTeamInput = z.infer<typeof createTeamInputSchema>;

export const signInInputSchema = z.object({
	email: z.string().trim().toLowerCase().pipe(z.email({ message: 'Enter a valid e-mail address, like name@example.org.' })),
	redirectTo: z
		.string()
		.default('/')
		// Only same-site paths: never an open redirect.
		.transform((v) => (v.startsWith('/') && !v.startsWith('//') ? v : '/'))
});
