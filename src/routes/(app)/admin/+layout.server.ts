import { error } from '@sveltejs/kit';
import type { LayoutServerLoad } from './$types';

/** Admin pages: page loads stop here; each load and action also asks the service, which re-checks. */
export const load: LayoutServerLoad = ({ locals }) => {
	if (locals.user?.accountRole !== 'admin') error(403, 'Only admins may see this page.');
	return {};
};
