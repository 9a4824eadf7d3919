/** People, groups and counts files for the claims, datasets, checks and tokens service tests. */
import { sampledCounts, states, toCountsCsv } from '../../src/lib/certify';
import type { Database } from '../../src/lib/server/db';
import type { GroupRole } from '../../src/lib/server/db/models/Membership';
import { newId } from '../../src/lib/server/core/ids';

export async function addGroup(database: Database, name: string): Promise<string> {
	const id = newId();
	await database.models.Group.create({ id, name });
	return id;
}

/** A verified researcher, member of the given groups; no real password hash is needed here. */
const emailFor = (name: string, id: string) =>
	`${name.toLowerCase().replace(/\W+/g, '.')}.${id.slice(0, 6)}@example.test`;

export async function addUser(
	database: Database,
	name: string,
	groups: [string, GroupRole][] = [],
	accountRole: 'researcher' | 'editor' = 'researcher'
): Promise<string> {
	const id = newId();
	await database.models.User.create({
		id,
		email: emailFor(name, id),
		name,
		passwordHash: 'x',
		accountRole,
		emailVerifiedAt: new Date()
	});
	for (const [groupId, role] of groups)
		await database.models.Membership.create({ id: newId(), groupId, userId: id, role });
	return id;
}

/** A journal editor's account (no group), with the address a claim is shared to. */
export async function addEditor(
	database: Database,
	name: string
): Promise<{ id: string; email: string }> {
	const id = await addUser(database, name, [], 'editor');
	return { id, email: emailFor(name, id) };
}

/** Long-form CSV of Poisson counts from an isotropic state with visibility 0.9. */
export function countsCsv(d = 5, bases = [0, 1], pairs = 50_000, seed = 7): string {
	return toCountsCsv(sampledCounts(states.isotropic(d, 0.9), bases, pairs, seed), [
		'simulated test source'
	]);
}

export const bytesOf = (text: string) => new TextEncoder().encode(text);

export const claimFields = {
	title: 'Time-bin pairs, run 3',
	sourceDescription: 'Simulated isotropic source with visibility 0.9',
	dimension: 5,
	method: 'mub-correlation' as const,
	claimedSchmidtNumber: 3
};
