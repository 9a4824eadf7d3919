import { json } from '@sveltejs/kit';
import { app } from '$lib/server/app/app';
import { publishCheckpoint } from '$lib/server/ledger/ledger-checkpoint';
import type { RequestHandler } from './$types';

/** Public: the ledger's signed checkpoint now (entries, head hash, time, key id, signature). */
export const GET: RequestHandler = async () => {
	const { database } = await app();
	return json(await publishCheckpoint(database));
};
