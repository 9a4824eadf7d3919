/** How a certificate's DOI registration stands, in words for pages (browser-importable). */

/**
 * pending: not yet accepted by the registry (the DOI may not resolve yet); registered: the
 * registry holds the current metadata; updating: registered, a change (withdrawn, superseded) is
 * on its way; failed: the registry refused it or stayed unreachable, an admin must look.
 */
export type DoiRegistration = 'pending' | 'registered' | 'updating' | 'failed';

export const DOI_REGISTRATION_WORDS: Record<DoiRegistration, string> = {
	pending:
		'DOI registration pending: the DOI is reserved for this certificate and resolves once the registry has accepted it.',
	registered: 'Registered: the DOI resolves to the public record of this certificate.',
	updating: 'Registered; the update of its record (a change of status) is pending at the registry.',
	failed:
		'DOI registration has not succeeded (the registry refused it or stayed unreachable); the DOI may not resolve yet.'
};

/** Outbox states in which an admin's "try again now" applies (the others: sent, being sent, done). */
export const RETRYABLE_DOI_STATES: readonly string[] = ['failed', 'retrying'];
