import { METHOD_IDS } from '$lib/certify';
import { describeMethod } from '$lib/methods/describe';
import type { PageServerLoad } from './$types';

/** Public (no sign-in): every method in a line or two, each linking to its page. */
export const load: PageServerLoad = () => ({
	methods: METHOD_IDS.map((id) => describeMethod(id, 5))
});
