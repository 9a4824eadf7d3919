/**
 * The DOI's creators and their ORCID iDs, against a real SQLite file: null while an account has
 * no iD linked, the linked iD once it has one (ORCID sign-in, migration 0022).
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { authorsOf, orcidOf } from '../../src/lib/server/certificates/doi-creators';
import { addGroup, addUser } from './backend-fixtures';
import { temporaryDatabase } from './db';

let ctx: Awaited<ReturnType<typeof temporaryDatabase>>;
beforeAll(async () => (ctx = await temporaryDatabase()));
afterAll(async () => ctx?.close());

describe('creators of a certificate DOI', () => {
	it('lists the claim creator first, then the group, and reads each account’s linked ORCID iD', async () => {
		const { database } = ctx;
		const lake = await addGroup(database, 'Lake optics');
		const lead = await addUser(database, 'Ada Lind', [[lake, 'lead']]);
		const author = await addUser(database, 'Bo Strand', [[lake, 'author']]);
		const creators = await authorsOf(database, { createdBy: author, groupId: lake });
		expect(creators).toEqual([
			{ userId: author, name: 'Bo Strand' },
			{ userId: lead, name: 'Ada Lind' }
		]);
		expect(await orcidOf(database, author)).toBeNull();

		// An iD linked to the account (ORCID sign-in, migration 0022) is named from then on.
		await database.sequelize.query(`update users set orcid = '0000-0002-1825-0097' where id = ?`, {
			replacements: [author]
		});
		expect(await orcidOf(database, author)).toBe('0000-0002-1825-0097');
		expect(await orcidOf(database, lead)).toBeNull();
		expect(await orcidOf(database, null)).toBeNull();
	});
});
