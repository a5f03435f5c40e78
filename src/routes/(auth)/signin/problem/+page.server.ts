import type { PageServerLoad } from './$types';

// Auth.js sends people here with ?error=<kind>; each kind gets a plain explanation.
const MESSAGES: Record<string, { title: string; text: string }> = {
	Verification: {
		title: 'This sign-in link no longer works',
		text: 'Sign-in links work once and expire after 24 hours. This one has been used already or has expired. Ask for a new link.'
	},
	AccessDenied: {
		title: 'This address cannot sign in',
		text: 'No Phasewright account uses this address. Ask your team lead to add you.'
	},
	Configuration: {
		title: 'Sign-in is not available',
		text: 'The server is not configured for sign-in right now. Tell the administrator.'
	}
};

export const load: PageServerLoad = ({ url }): { title: string; text: string } => {
	const kind = url.searchParams.get('error') ?? '';
	return MESSAGES[kind] ?? { title: 'Sign-in did not work', text: 'Something went wrong while signing you in. Ask for a new link.' };
};
