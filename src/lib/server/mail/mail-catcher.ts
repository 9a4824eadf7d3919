/**
 * The local mail catcher: a real SMTP server on 127.0.0.1 that accepts every message and stores it
 * as a MailMessage row, for development and the demo (admins read it on /admin/outbox).
 */
import type { AddressInfo } from 'node:net';
import { simpleParser, type AddressObject } from 'mailparser';
import { SMTPServer, type SMTPServerDataStream, type SMTPServerSession } from 'smtp-server';
import type { Database } from '../db';
import { newId } from '../core/ids';

export interface MailCatcher {
	port: number;
	close(): Promise<void>;
}

const MAX_MESSAGE_BYTES = 5 * 1024 * 1024;

const addressText = (value: AddressObject | AddressObject[] | undefined): string =>
	[value ?? []]
		.flat()
		.map((a) => a.text)
		.join(', ');

async function readAll(stream: SMTPServerDataStream): Promise<Buffer> {
	const chunks: Buffer[] = [];
	for await (const chunk of stream) chunks.push(chunk as Buffer);
	return Buffer.concat(chunks);
}

async function storeMessage(database: Database, raw: Buffer, session: SMTPServerSession) {
	const parsed = await simpleParser(raw);
	const envelopeFrom = session.envelope.mailFrom ? session.envelope.mailFrom.address : '';
	const envelopeTo = session.envelope.rcptTo.map((r) => r.address).join(', ');
	await database.models.MailMessage.create({
		id: newId(),
		from: addressText(parsed.from) || envelopeFrom,
		to: envelopeTo || addressText(parsed.to),
		subject: parsed.subject ?? '',
		text: parsed.text ?? '',
		html: parsed.html || null,
		raw: raw.toString('utf8')
	});
}

function createServer(database: Database): SMTPServer {
	const server = new SMTPServer({
		name: 'rankseal-mail-catcher',
		banner: 'Rankseal mail catcher',
		authOptional: true,
		disabledCommands: ['STARTTLS'],
		size: MAX_MESSAGE_BYTES,
		logger: false,
		onData(stream, session, callback) {
			// Answer 250 only once the row is written, so a resolved sendMail means a stored message.
			readAll(stream)
				.then((raw) => storeMessage(database, raw, session))
				.then(
					() => callback(),
					(error: Error) => callback(error)
				);
		}
	});
	// Errors while binding are handled by listen(); later ones (a client hanging up) are only logged.
	server.on(
		'error',
		(error) => server.server.listening && console.error('mail catcher:', error.message)
	);
	return server;
}

function listen(server: SMTPServer, port: number): Promise<number> {
	return new Promise((resolve, reject) => {
		const failed = (error: Error) => reject(error);
		server.server.once('error', failed);
		server.listen(port, '127.0.0.1', () => {
			server.server.off('error', failed);
			resolve((server.server.address() as AddressInfo).port);
		});
	});
}

const stop = (server: SMTPServer) => new Promise<void>((resolve) => server.close(() => resolve()));

/** Starts the catcher on the given port, or on any free port (logged) when that one is taken. */
export async function startMailCatcher(database: Database, port: number): Promise<MailCatcher> {
	let server = createServer(database);
	let bound: number;
	try {
		bound = await listen(server, port);
	} catch (error) {
		const code = (error as NodeJS.ErrnoException).code;
		if (code !== 'EADDRINUSE' && code !== 'EACCES') throw error;
		console.warn(
			`mail catcher: port ${port} is not available (${code}); using a free port instead`
		);
		await stop(server).catch(() => undefined);
		server = createServer(database);
		bound = await listen(server, 0);
	}
	console.log(`mail catcher: listening on 127.0.0.1:${bound}`);
	const running = server;
	return { port: bound, close: () => stop(running) };
}
