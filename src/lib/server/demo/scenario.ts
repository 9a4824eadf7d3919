/**
 * The demo scenario: invented people, groups and sources (no real lab, person or data). Counts
 * are simulated by the engine's simulator from fixed seeds, so every demo install is identical.
 */
import {
	sampledCounts,
	states,
	toCountsCsv,
	type MethodId,
	type SimulatedState
} from '$lib/certify';
import type { AccountRole } from '../db/models/User';
import type { GroupRole } from '../db/models/Membership';

export interface DemoPerson {
	key: string;
	name: string;
	email: string;
	password: string;
	accountRole: AccountRole;
	groupRole: GroupRole | null;
}

/** Documented in the README; demo passwords only. */
export const DEMO_PEOPLE: DemoPerson[] = [
	{
		key: 'lead',
		name: 'Tove Arnesdal',
		email: 'tove@halvorsen-lake.example',
		password: 'demo-lead-2026',
		accountRole: 'researcher',
		groupRole: 'lead'
	},
	{
		key: 'author1',
		name: 'Eliot Brann',
		email: 'eliot@halvorsen-lake.example',
		password: 'demo-author-2026',
		accountRole: 'researcher',
		groupRole: 'author'
	},
	{
		key: 'author2',
		name: 'Sunniva Kjerr',
		email: 'sunniva@halvorsen-lake.example',
		password: 'demo-author-2026',
		accountRole: 'researcher',
		groupRole: 'author'
	},
	{
		key: 'editor',
		name: 'Osric Lamb',
		email: 'editor@quarterly-optics.example',
		password: 'demo-editor-2026',
		accountRole: 'editor',
		groupRole: null
	},
	{
		key: 'admin',
		name: 'Rankseal Admin',
		email: 'admin@rankseal.example',
		password: 'demo-admin-2026',
		accountRole: 'admin',
		groupRole: null
	}
];

export const DEMO_GROUP = 'Halvorsen Lake Photonics (fictional)';

export interface DemoClaim {
	author: string;
	title: string;
	sourceDescription: string;
	method: MethodId;
	bases: number[];
	claimedSchmidtNumber: number;
	manuscriptReference: string | null;
	state: SimulatedState;
	pairsPerBasis: number;
	dataSeed: number;
}

export const DEMO_CLAIMS: DemoClaim[] = [
	{
		author: 'author1',
		title: 'Time-bin source TB-7: Schmidt number ≥ 5, steering test',
		sourceDescription:
			'Time-bin entangled pairs from a pulsed type-II source, seven bins per frame (simulated).',
		method: 'steering-2mub',
		bases: [0, 1],
		claimedSchmidtNumber: 5,
		manuscriptReference: 'HLP-2026-014 (in preparation)',
		state: states.isotropic(7, 0.92),
		pairsPerBasis: 200_000,
		dataSeed: 7101
	},
	{
		author: 'author1',
		title: 'Time-bin source TB-7: full Schmidt number 7, steering test',
		sourceDescription:
			'The same TB-7 run, claiming the full dimension one-sided device-independently (simulated).',
		method: 'steering-2mub',
		bases: [0, 1],
		claimedSchmidtNumber: 7,
		manuscriptReference: null,
		state: states.isotropic(7, 0.92),
		pairsPerBasis: 200_000,
		dataSeed: 7102
	},
	{
		author: 'author2',
		title: 'Spatial-mode source SM-11: Schmidt number ≥ 9 from four MUBs',
		sourceDescription:
			'Orbital-angular-momentum modes of a down-conversion source, eleven modes, four mutually unbiased bases (simulated).',
		method: 'mub-correlation',
		bases: [0, 1, 2, 3],
		claimedSchmidtNumber: 9,
		manuscriptReference: 'HLP-2026-021',
		state: states.isotropic(11, 0.9),
		pairsPerBasis: 500_000,
		dataSeed: 1101
	},
	{
		author: 'lead',
		title: 'Frequency-bin comb FB-5: fidelity bound, Schmidt number ≥ 4',
		sourceDescription:
			'Frequency-bin pairs from an on-chip microring comb, five bins, slightly dephased (simulated).',
		method: 'fidelity-two-basis',
		bases: [0, 1],
		claimedSchmidtNumber: 4,
		manuscriptReference: null,
		state: states.dephased(5, 0.96, 0.97),
		pairsPerBasis: 300_000,
		dataSeed: 501
	}
];

/** The counts file of a demo claim, as an author would upload it. */
export function demoCountsCsv(claim: DemoClaim): string {
	const d = claim.state.dimension;
	const bases = claim.method === 'mub-correlation' ? claim.bases : [0, 1];
	const data = sampledCounts(claim.state, bases, claim.pairsPerBasis, claim.dataSeed);
	return toCountsCsv(data, [
		`Simulated demo data for "${claim.title}" (d = ${d}); not a measurement.`
	]);
}
