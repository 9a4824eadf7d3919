/** The one rule for a withdrawal's reason: forms, the API body and the service all use it. */
import { z } from 'zod';

/** Characters, after trimming. */
export const WITHDRAW_REASON = { min: 3, max: 500 } as const;

export const WITHDRAW_REASON_WORDS = `Say why in ${WITHDRAW_REASON.min} to ${WITHDRAW_REASON.max} characters.`;

/** The reason as a form or body gives it; the service checks the lower bound and the text rules. */
export const withdrawReasonField = z
	.string('Say why the claim is withdrawn.')
	.trim()
	.max(WITHDRAW_REASON.max, WITHDRAW_REASON_WORDS);
