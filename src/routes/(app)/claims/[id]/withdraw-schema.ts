/** The claim page's withdraw form: a reason, and the box that confirms the step cannot be undone. */
import { z } from 'zod';

export const withdrawConfirmSchema = z.object({
	reason: z.string().max(2000),
	confirm: z.literal('yes', {
		error: 'Tick the box to confirm: a withdrawal cannot be undone.'
	})
});
