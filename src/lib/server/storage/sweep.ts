/** The start-up sweep: temporary and unowned files go; rows whose files are gone are named loudly. */
import type { Database } from '../db';
import { sweepOrphanFiles } from './certificate-store';
import { sweepUploadFiles } from './counts-sweep';

export async function startUpSweep(database: Database): Promise<void> {
	const certificates = await sweepOrphanFiles(database);
	const uploads = await sweepUploadFiles(database);
	const removed = certificates.length + uploads.removed.length;
	if (removed) console.log(`start-up sweep: removed ${removed} file(s) no row owns`);
	for (const file of uploads.missing) console.error(`start-up sweep: ${file} is missing`);
}
