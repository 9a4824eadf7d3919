/**
 * Taking back a wrongly uploaded counts file: allowed until a check has used it (then the file is
 * part of a result and stays). The row goes, with an audit event; the bytes go once no row of
 * any claim names them.
 */
import { accountIdOf, type Actor } from '../core/actor';
import { requireClaim } from '../access/permissions';
import type { Database } from '../db';
import { writeTransaction } from '../db/transactions';
import { audit } from '../core/audit';
import { removeCounts } from '../storage/counts-store';
import { ConflictError, NotFoundError } from '../core/errors';

export async function removeDataset(
	database: Database,
	actor: Actor,
	claimId: string,
	datasetId: string
): Promise<void> {
	const userId = accountIdOf(actor);
	const { Check, Dataset } = database.models;
	await writeTransaction(database, async (transaction) => {
		const claim = await requireClaim(database, actor, claimId, 'remove-dataset', transaction);
		const row = await Dataset.findOne({ where: { id: datasetId, claimId }, transaction });
		if (!row) throw new NotFoundError('No such dataset on this claim.');
		if (await Check.count({ where: { datasetId }, transaction }))
			throw new ConflictError(
				'A check has used this file, so it stays with the claim as the record of that check.'
			);
		const { sha256, originalName, byteSize } = row.get({ plain: true });
		await row.destroy({ transaction });
		await audit(
			database,
			{
				actorId: userId,
				groupId: claim.groupId,
				action: 'dataset.removed',
				subjectType: 'dataset',
				subjectId: datasetId,
				details: { sha256, originalName, byteSize }
			},
			transaction
		);
		// Uploads store bytes inside their own write transaction, so none can slip in between.
		if ((await Dataset.count({ where: { sha256 }, transaction })) === 0) await removeCounts(sha256);
	});
}
