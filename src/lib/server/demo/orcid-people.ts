/**
 * Invented ORCID iDs for the demo's fake ORCID sign-in page. Their check characters are right
 * (MOD 11-2) but they lie in 0009-0099-…, past the blocks ORCID assigns today (0000-0001-5000 to
 * 0000-0003-5000 and 0009-0000 to 0009-0010, from memory), so they name nobody.
 */
export interface DemoOrcidPerson {
	orcid: string;
	givenName: string;
	familyName: string;
	/** The demo account (scenario.ts key) seeded with this iD linked; null: not linked. */
	linkedTo: string | null;
	note: string;
}

export const DEMO_ORCID_PEOPLE: DemoOrcidPerson[] = [
	{
		orcid: '0009-0099-0001-0000',
		givenName: 'Eliot',
		familyName: 'Brann',
		linkedTo: 'author1',
		note: 'linked to Eliot’s demo account: signs straight in'
	},
	{
		orcid: '0009-0099-0002-0006',
		givenName: 'Sunniva',
		familyName: 'Kjerr',
		linkedTo: null,
		note: 'not linked yet: Sunniva links it with her password'
	},
	{
		orcid: '0009-0099-0003-0001',
		givenName: 'Maren',
		familyName: 'Holt',
		linkedTo: null,
		note: 'no Rankseal account: a newcomer'
	}
];
