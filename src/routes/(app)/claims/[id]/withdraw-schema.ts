/** The claim page's withdraw form: a reason, and the box that confirms the step cannot be undone. */
import { z } from 'zod';
import { withdrawReasonField } from '$lib/claims/withdrawal';

export const withdrawConfirmSchema = z.object({
	reason: withdrawReasonField,
	confirm: z.literal('yes', {
		error: 'Tick the box to confirm: a withdrawal cannot be undone.'
	})
});
