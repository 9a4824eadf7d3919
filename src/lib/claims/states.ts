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

/** The states some action can put a claim in today: new, checked, certified, shared with an editor. */
export const REACHABLE_CLAIM_STATES: readonly ClaimState[] = [
	'draft',
	'checked',
	'certified',
	'shared'
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
