import type { LayoutServerLoad } from './$types';

/** Every page knows who is signed in (or null), for the header's navigation. */
export const load: LayoutServerLoad = ({ locals }) => ({ user: locals.user });
