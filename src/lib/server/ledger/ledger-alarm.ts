/**
 * The start-up check (and the admin pages' banner): does the ledger still reach the last
 * checkpoint this service published? A ledger cut short — an older database put back, entries
 * deleted by hand — fails it, and withdrawals recorded after the cut may be undone.
 */
import type { LedgerCheckpoint } from '../../evidence/checkpoint';
import type { Database } from '../db';
import { memoryFile, rememberedCheckpoint, sweepMemoryParts } from './checkpoint-memory';
import { checkAgainst, publishCheckpoint } from './ledger-checkpoint';

export interface LedgerAlarm {
	remembered: LedgerCheckpoint | null;
	where: string;
	problem: string;
	/** Where the remembered checkpoint is kept (the admin removes it once they have reconciled). */
	file: string;
}

/** Null while the ledger extends the remembered checkpoint (or none is remembered yet). */
export async function ledgerAlarm(database: Database): Promise<LedgerAlarm | null> {
	const file = memoryFile();
	let remembered: LedgerCheckpoint | null;
	try {
		remembered = rememberedCheckpoint();
	} catch (error) {
		return { remembered: null, where: 'checkpoint', problem: (error as Error).message, file };
	}
	if (!remembered) return null;
	const check = await checkAgainst(database, remembered);
	return check.extends ? null : { remembered, where: check.where!, problem: check.problem!, file };
}

export const alarmText = (alarm: LedgerAlarm): string =>
	`the ledger does not reach the last checkpoint this service published` +
	(alarm.remembered ? ` (${alarm.remembered.entries} entries, ${alarm.remembered.at})` : '') +
	`: ${alarm.where}: ${alarm.problem}. Withdrawals and certificates recorded after the cut may ` +
	`be missing; see README "Running a server" (kept in ${alarm.file}).`;

/** At start-up: logs the alarm, or remembers the current checkpoint when all is well. */
export async function checkLedgerAtStart(database: Database): Promise<LedgerAlarm | null> {
	sweepMemoryParts();
	const alarm = await ledgerAlarm(database);
	if (alarm) console.error(`LEDGER WARNING: ${alarmText(alarm)}`);
	else await publishCheckpoint(database);
	return alarm;
}
