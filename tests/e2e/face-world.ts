/**
 * The demo world (pages-world.ts) plus what the role and withdrawal pages need: a certified demo
 * claim withdrawn with a reason (by the lead), and a fresh claim by author1 with no check yet.
 */
import path from 'node:path';
import { userActor } from '../../src/lib/server/core/actor';
import { openDatabase } from '../../src/lib/server/db';
import { DEMO_CLAIMS, DEMO_PEOPLE } from '../../src/lib/server/demo/scenario';
import { withdrawClaim } from '../../src/lib/server/claims/claim-withdraw';
import { createClaim } from '../../src/lib/server/claims/claims';
import { seedPagesWorld, type PagesWorld } from './pages-world';

export const WITHDRAW_REASON = 'The comb drifted during run 3; counts re-taken (test reason).';

export interface FaceWorld extends PagesWorld {
	/** Claim ids by demo title prefix (TB-7 ≥ 5 is shared with the editor), and the fresh one. */
	claims: { shared: string; withdrawn: string; spare: string; fresh: string };
	withdrawnCertificate: string;
}

export async function seedFaceWorld(): Promise<FaceWorld> {
	const world = await seedPagesWorld();
	const saved = { ...process.env };
	process.env.RANKSEAL_DATA_DIR = world.dataDir;
	const database = await openDatabase(path.join(world.dataDir, 'rankseal.sqlite'));
	try {
		const { Claim, Certificate, User } = database.models;
		const idOf = async (title: string) =>
			(await Claim.findOne({ where: { title } }))!.get('id') as string;
		const person = async (key: string) => {
			const email = DEMO_PEOPLE.find((p) => p.key === key)!.email;
			const user = await User.findOne({ where: { email } });
			return (await userActor(database, user!.get('id') as string))!;
		};
		// The first demo claim is shared; of the others, one with a certificate is withdrawn.
		const others = await Promise.all(DEMO_CLAIMS.slice(1).map((c) => idOf(c.title)));
		const certified = await Certificate.findOne({ where: { claimId: others } });
		const withdrawn = certified!.get('claimId') as string;
		await withdrawClaim(database, await person('lead'), withdrawn, WITHDRAW_REASON);
		const fresh = await createClaim(database, await person('author1'), {
			title: 'Fresh claim, no check yet (face test)',
			sourceDescription: 'Nothing measured yet.',
			dimension: 5,
			method: 'mub-correlation',
			bases: [0, 1],
			claimedSchmidtNumber: 2,
			manuscriptReference: null
		});
		return {
			...world,
			claims: {
				shared: await idOf(DEMO_CLAIMS[0].title),
				withdrawn,
				spare: others.find((id) => id !== withdrawn)!,
				fresh: fresh.id
			},
			withdrawnCertificate: certified!.get('id') as string
		};
	} finally {
		await database.sequelize.close();
		process.env = saved;
	}
}
