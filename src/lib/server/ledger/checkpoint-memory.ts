/**
 * The last ledger checkpoint this service published, remembered in the data folder beside (not
 * in) the database: putting back an older database file leaves it in place, so the next start
 * sees that the ledger no longer reaches it. Backups leave it out for the same reason.
 */
import { existsSync, readdirSync, readFileSync, renameSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { parseCheckpoint, type LedgerCheckpoint } from '../../evidence/checkpoint';
import { config } from '../core/config';

export const CHECKPOINT_MEMORY = 'published-checkpoint.json';

export const memoryFile = () => path.join(config().dataDir, CHECKPOINT_MEMORY);

/** The remembered checkpoint; null when there is none yet. Throws when the file is damaged. */
export function rememberedCheckpoint(): LedgerCheckpoint | null {
	const file = memoryFile();
	if (!existsSync(file)) return null;
	const checkpoint = parseCheckpoint(readFileSync(file, 'utf8'));
	if (!checkpoint) throw new Error(`${file} is not a ledger checkpoint`);
	return checkpoint;
}

/** Writes the checkpoint whole or not at all (a temporary file renamed over the old one). */
export function rememberCheckpoint(checkpoint: LedgerCheckpoint): void {
	const file = memoryFile();
	const part = `${file}.${process.pid}.part`;
	writeFileSync(part, JSON.stringify(checkpoint, null, '\t') + '\n', { mode: 0o600, flush: true });
	renameSync(part, file);
}

/** Removes the temporary file of a write cut short (start-up, before anything else writes one). */
export function sweepMemoryParts(): void {
	const { dataDir } = config();
	if (!existsSync(dataDir)) return;
	for (const name of readdirSync(dataDir))
		if (name.startsWith(`${CHECKPOINT_MEMORY}.`) && name.endsWith('.part'))
			rmSync(path.join(dataDir, name), { force: true });
}
