/** A certificate's PDF or evidence bundle as a download, for the API and the pages alike. */
import type { Actor } from '../core/actor';
import type { Database } from '../db';
import { certificateFile } from './certificate-reads';

export async function certificateDownload(
	database: Database,
	caller: Actor,
	id: string,
	kind: 'pdf' | 'bundle'
): Promise<Response> {
	const file = await certificateFile(database, caller, id, kind);
	return new Response(new Uint8Array(file.bytes), {
		headers: {
			'content-type': file.contentType,
			'content-length': String(file.bytes.byteLength),
			'content-disposition': `attachment; filename="${file.filename}"`,
			// An issued certificate never changes; only members may fetch it.
			'cache-control': 'private, max-age=31536000, immutable'
		}
	});
}
