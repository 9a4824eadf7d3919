/** The claim states, exported once for the model, the schema, the filters and the pages. */
export const CLAIM_STATES = [
	'draft',
	'checked',
	'certified',
	'shared',
	'withdrawn',
	'superseded'
] as const;

export type ClaimState = (typeof CLAIM_STATES)[number];

/**
 * The states some action can put a claim in today (the claim list's filter offers these): new,
 * checked, certified, shared with an editor, withdrawn (claim-withdraw.ts). No action makes a
 * claim superseded; certificates are superseded, not claims.
 */
export const REACHABLE_CLAIM_STATES: readonly ClaimState[] = [
	'draft',
	'checked',
	'certified',
	'shared',
	'withdrawn'
];

/** A state in a reader's words, for lists and filters. */
export const CLAIM_STATE_LABELS: Record<ClaimState, string> = {
	draft: 'draft (not yet checked)',
	checked: 'checked',
	certified: 'certified',
	shared: 'shared with an editor',
	withdrawn: 'withdrawn',
	superseded: 'superseded'
};
