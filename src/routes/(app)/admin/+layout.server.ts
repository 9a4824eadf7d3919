import { app } from '$lib/server/app/app';
import { decideService } from '$lib/server/access/permissions';
import { alarmText, ledgerAlarm } from '$lib/server/ledger/ledger-alarm';
import type { LayoutServerLoad } from './$types';

/** Admin pages: a ledger cut short below the last published checkpoint is shown at the top. */
export const load: LayoutServerLoad = async ({ locals }) => {
	const { database } = await app();
	if ((await decideService(database, locals.actor, 'read-service-health')) !== 'allowed')
		return { ledgerAlarm: null };
	const alarm = await ledgerAlarm(database);
	return { ledgerAlarm: alarm ? alarmText(alarm) : null };
};
