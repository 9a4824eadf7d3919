import { error } from '@sveltejs/kit';
import { z } from 'zod';
import { isMethodId } from '$lib/certify';
import { describeMethod, EXAMPLE_DIMENSIONS } from '$lib/methods/describe';
import { describeTarget } from '$lib/methods/describe-target';
import { TARGET_METHOD } from '$lib/claims/target';
import type { PageServerLoad } from './$types';

const dimensionQuery = z.coerce
	.number()
	.refine((d) => (EXAMPLE_DIMENSIONS as readonly number[]).includes(d))
	.catch(5);

/** Public (no sign-in): one method explained, with its ladder for d = 3, 5, 7 or 11 (?d=). */
export const load: PageServerLoad = ({ params, url }) => {
	const d = dimensionQuery.parse(url.searchParams.get('d') ?? 5);
	if (params.id === TARGET_METHOD)
		return { method: describeTarget(d), dimensions: [...EXAMPLE_DIMENSIONS] };
	if (!isMethodId(params.id)) error(404, { message: 'No such method.', code: 'not_found' });
	return { method: describeMethod(params.id, d), dimensions: [...EXAMPLE_DIMENSIONS] };
};
