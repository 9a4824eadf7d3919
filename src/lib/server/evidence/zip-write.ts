/** The evidence bundle as a zip (archiver), entries in a fixed order with the issue time as their date. */
import { ZipArchive } from 'archiver';
import type { EvidenceFiles } from '../../evidence/layout';

export function zipFiles(files: EvidenceFiles, date: Date, folder: string): Promise<Buffer> {
	const zip = new ZipArchive({ zlib: { level: 9 } });
	const chunks: Buffer[] = [];
	const done = new Promise<Buffer>((resolve, reject) => {
		zip.on('data', (chunk: Buffer) => chunks.push(chunk));
		zip.on('end', () => resolve(Buffer.concat(chunks)));
		zip.on('error', reject);
		zip.on('warning', reject);
	});
	for (const name of Object.keys(files).sort())
		zip.append(Buffer.from(files[name]), { name: `${folder}/${name}`, date });
	void zip.finalize();
	return done;
}
