/**
 * A counts set: several counts files uploaded together as one dataset (issue 18), e.g. one d × d
 * grid per basis with the basis given beside each file. Stored as one text file that keeps every
 * file's bytes exactly, each after a header line with its size, SHA-256, given basis and name:
 *
 *   # rankseal counts set: 2 files
 *   # file 1: bytes=118 sha256=<hex> basis=0 name=h-basis.tsv
 *   <the 118 bytes>\n
 *   # file 2: bytes=120 sha256=<hex> basis=- name=rest.csv
 *   <the 120 bytes>\n
 *
 * Reading it reads each file as it would be read alone and joins their tables; a basis in two
 * files is refused. Errors name the file and its own line.
 */
import { sha256 } from '@noble/hashes/sha2.js';
import { bytesToHex } from '@noble/hashes/utils.js';
import { InputError, MAX_COUNTS_FILE_BYTES, type CountsDataset, type CountTable } from './counts';
import { TableBudget } from './counts-budget';

const MAGIC = '# rankseal counts set: ';
const HEADER = /^# file (\d+): bytes=(\d+) sha256=([0-9a-f]{64}) basis=(\d+|-) name=(.*)$/;
const NEWLINE = 0x0a;

/** At most this many files in one upload (a complete set of bases in d = 31 is 32). */
export const MAX_COUNTS_SET_FILES = 32;

export interface CountsSetFile {
	name: string;
	bytes: Uint8Array;
	/** The basis given beside a file holding one grid and no `# basis` line; null otherwise. */
	basis: number | null;
}

/** How one file alone is read: the caller's dispatch (parse.ts), with the set's shared budget. */
export type ReadOne = (
	file: CountsSetFile,
	dimension: number,
	budget: TableBudget
) => CountsDataset;

const encoder = new TextEncoder();

/** The set's bytes: a first line, then each file after its header line and before a newline. */
export function writeCountsSet(files: CountsSetFile[]): Uint8Array {
	const chunks: Uint8Array[] = [encoder.encode(`${MAGIC}${files.length} files\n`)];
	files.forEach((file, i) => {
		const name = file.name.replace(/[\r\n]+/g, ' ');
		const hash = bytesToHex(sha256(file.bytes));
		const header = `# file ${i + 1}: bytes=${file.bytes.byteLength} sha256=${hash} basis=${file.basis ?? '-'} name=${name}\n`;
		chunks.push(encoder.encode(header), file.bytes, encoder.encode('\n'));
	});
	const out = new Uint8Array(chunks.reduce((n, c) => n + c.byteLength, 0));
	let at = 0;
	for (const chunk of chunks) {
		out.set(chunk, at);
		at += chunk.byteLength;
	}
	return out;
}

const headBytes = (input: Uint8Array | string) =>
	typeof input === 'string' ? input.slice(0, MAGIC.length) : input.subarray(0, MAGIC.length);

/** True for a counts set (its first line), whatever the rest holds. */
export function isCountsSet(input: Uint8Array | string): boolean {
	const head = headBytes(input);
	return (typeof head === 'string' ? head : new TextDecoder().decode(head)) === MAGIC;
}

const damaged = (what: string) => new InputError(`the counts set is damaged: ${what}`);

function lineAt(bytes: Uint8Array, start: number): { text: string; next: number } {
	const end = bytes.indexOf(NEWLINE, start);
	if (end < 0) throw damaged('a header line has no end');
	return { text: new TextDecoder().decode(bytes.subarray(start, end)), next: end + 1 };
}

/** The files of a set, each checked against the size and SHA-256 its header states. */
export function splitCountsSet(input: Uint8Array | string): CountsSetFile[] {
	const bytes = typeof input === 'string' ? encoder.encode(input) : input;
	if (bytes.byteLength > MAX_COUNTS_FILE_BYTES + 64 * 1024)
		throw new InputError(`the counts set is larger than ${MAX_COUNTS_FILE_BYTES} bytes`);
	const first = lineAt(bytes, 0);
	const count = Number(/^# rankseal counts set: (\d+) files$/.exec(first.text)?.[1]);
	if (!(count >= 1 && count <= MAX_COUNTS_SET_FILES)) throw damaged('its first line');
	const files: CountsSetFile[] = [];
	let at = first.next;
	for (let i = 1; i <= count; i++) {
		const { text, next } = lineAt(bytes, at);
		const match = HEADER.exec(text);
		if (!match || Number(match[1]) !== i) throw damaged(`the header of file ${i}`);
		const end = next + Number(match[2]);
		if (end >= bytes.byteLength || bytes[end] !== NEWLINE) throw damaged(`the size of file ${i}`);
		const body = bytes.subarray(next, end);
		if (bytesToHex(sha256(body)) !== match[3]) throw damaged(`the SHA-256 of file ${i}`);
		files.push({ name: match[5], bytes: body, basis: match[4] === '-' ? null : Number(match[4]) });
		at = end + 1;
	}
	if (at !== bytes.byteLength) throw damaged('bytes after its last file');
	return files;
}

/** The error of file i, naming it; the line and column stay those of its own text. */
function inFile(error: unknown, file: CountsSetFile, i: number, n: number): unknown {
	if (!(error instanceof InputError)) return error;
	const message = error.message.replace(/^line \d+(, column \d+)?: /, '');
	return new InputError(
		`in ${file.name} (file ${i + 1} of ${n}): ${message}`,
		error.line,
		error.column
	);
}

function join(read: CountsDataset[], files: CountsSetFile[]): Map<number, CountTable> {
	const tables = new Map<number, CountTable>();
	const from = new Map<number, string>();
	read.forEach((dataset, i) => {
		for (const table of dataset.tables) {
			if (tables.has(table.basis))
				throw new InputError(
					`in ${files[i].name} (file ${i + 1} of ${files.length}): basis ${table.basis} is in ${from.get(table.basis)} already`
				);
			tables.set(table.basis, table);
			from.set(table.basis, files[i].name);
		}
	});
	return tables;
}

/** The declared Fourier conventions of the files must agree (JSON files may declare one). */
function declaredFourier(read: CountsDataset[]) {
	const declared = read.map((x) => x.declaredFourier).filter((x) => x !== undefined);
	const other = declared.findIndex((x) => x.convention !== declared[0]?.convention);
	if (other >= 0)
		throw new InputError(
			`the files declare different Fourier conventions ("${declared[0].convention}" and "${declared[other].convention}"): make them agree`
		);
	return declared[0];
}

/** Reads every file of the set and joins their tables into one dataset. */
export function parseCountsSet(
	input: Uint8Array | string,
	dimension: number,
	readOne: ReadOne
): CountsDataset {
	const files = splitCountsSet(input);
	const budget = new TableBudget();
	const read = files.map((file, i) => {
		try {
			return readOne(file, dimension, budget);
		} catch (error) {
			throw inFile(error, file, i, files.length);
		}
	});
	const tables = [...join(read, files).values()].sort((x, y) => x.basis - y.basis);
	const fourier = declaredFourier(read);
	const each = read.map(
		(x, i) => `${files[i].name}: ${x.readAs?.replace(/^read as /, '') ?? describe(x)}`
	);
	return {
		dimension: read[0].dimension,
		tables,
		...(fourier ? { declaredFourier: fourier } : {}),
		readAs: `read as ${files.length} file${files.length === 1 ? '' : 's'} — ${each.join('; ')}`
	};
}

/** Words for a file whose reader does not describe its layout (long form, JSON). */
function describe(dataset: CountsDataset): string {
	const bases = dataset.tables.map((t) => t.basis);
	return `basis${bases.length === 1 ? '' : 'es'} ${bases.join(', ')}`;
}
