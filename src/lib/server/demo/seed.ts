/**
 * Seeds the demo scenario (scenario.ts) once: people with documented passwords, a group, claims
 * across the three methods with their counts files, a check of each, and an API token for one
 * author written to data/demo/api-token.txt; once the checks have run, a certificate for each
 * supported claim, then the review scene (review-seed.ts). Running it again changes nothing, except
 * that a missing token file gets a fresh token and a supported claim left without a certificate gets one.
 */
import { existsSync, mkdirSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { hashPassword } from '../accounts/auth';
import { config } from '../core/config';
import type { Database } from '../db';
import { userActor } from '../core/actor';
import { writeTransaction } from '../db/transactions';
import { startCheck } from '../checks/checks';
import { createClaim } from '../claims/claims';
import { addDataset } from '../datasets/datasets';
import { newId } from '../core/ids';
import { createToken } from '../accounts/tokens';
import { seedReview } from './review-seed';
import { certifyDemoClaims } from './certify-demo';
import { DEMO_CLAIMS, DEMO_GROUP, DEMO_PEOPLE, demoCountsCsv } from './scenario';
import { DEMO_ORCID_PEOPLE } from './orcid-people';

export const demoTokenFile = () => path.join(config().dataDir, 'demo', 'api-token.txt');

async function seedPeople(database: Database): Promise<Map<string, string>> {
	const { User, Group, Membership } = database.models;
	const ids = new Map<string, string>();
	const groupId = newId();
	await writeTransaction(database, async (transaction) => {
		await Group.create({ id: groupId, name: DEMO_GROUP }, { transaction });
		for (const person of DEMO_PEOPLE) {
			const id = newId();
			ids.set(person.key, id);
			const passwordHash = await hashPassword(person.password);
			const { name, email, accountRole } = person;
			const orcid = DEMO_ORCID_PEOPLE.find((p) => p.linkedTo === person.key)?.orcid ?? null;
			await User.create(
				{ id, name, email, passwordHash, accountRole, emailVerifiedAt: new Date(), orcid },
				{ transaction }
			);
			if (person.groupRole)
				await Membership.create(
					{ id: newId(), groupId, userId: id, role: person.groupRole },
					{ transaction }
				);
		}
	});
	return ids;
}

async function seedClaims(database: Database, ids: Map<string, string>): Promise<string[]> {
	const claimIds: string[] = [];
	for (const demo of DEMO_CLAIMS) {
		const author = (await userActor(database, ids.get(demo.author)!))!;
		const claim = await createClaim(database, author, {
			title: demo.title,
			sourceDescription: demo.sourceDescription,
			dimension: demo.state.dimension,
			method: demo.method,
			bases: demo.bases,
			claimedSchmidtNumber: demo.claimedSchmidtNumber,
			manuscriptReference: demo.manuscriptReference
		});
		const file = new TextEncoder().encode(demoCountsCsv(demo));
		await addDataset(database, author, claim.id, {
			bytes: file,
			originalName: `${demo.title.split(':')[0]}.csv`
		});
		await startCheck(database, author, claim.id, {});
		claimIds.push(claim.id);
	}
	return claimIds;
}

async function writeDemoToken(database: Database, userId: string): Promise<void> {
	const owner = (await userActor(database, userId))!;
	const { token } = await createToken(database, owner, { name: 'demo pipeline' });
	mkdirSync(path.dirname(demoTokenFile()), { recursive: true });
	writeFileSync(demoTokenFile(), token + '\n', { mode: 0o600 });
}

export async function seedDemo(database: Database): Promise<'seeded' | 'present'> {
	const lead = DEMO_PEOPLE.find((p) => p.key === 'lead')!;
	const existing = await database.models.User.findOne({ where: { email: lead.email } });
	if (existing) {
		if (!existsSync(demoTokenFile())) {
			const author = await database.models.User.findOne({ where: { email: DEMO_PEOPLE[1].email } });
			if (author) await writeDemoToken(database, author.get('id') as string);
		}
		await certifyDemoClaims(database);
		return 'present';
	}
	const ids = await seedPeople(database);
	const claimIds = await seedClaims(database, ids);
	await writeDemoToken(database, ids.get('author1')!);
	await certifyDemoClaims(database);
	const people = { author: ids.get(DEMO_CLAIMS[0].author)!, editor: ids.get('editor')! };
	await seedReview(database, people, claimIds[0]);
	return 'seeded';
}
