import { METHOD_IDS } from '$lib/certify';
import { describeMethod } from '$lib/methods/describe';
import { describeTarget } from '$lib/methods/describe-target';
import type { PageServerLoad } from './$types';

/** Public (no sign-in): every method in a line or two, each linking to its page. */
export const load: PageServerLoad = () => ({
	methods: [...METHOD_IDS.map((id) => describeMethod(id, 5)), describeTarget(5)]
});
