/**
 * The SMTP side of outgoing mail, through nodemailer: a real server when SMTP_URL is set,
 * otherwise the local mail catcher (src/lib/server/mail/mail-catcher.ts), reached over TCP like any
 * other. Services never send: they write to the outbox (services/mail-queue.ts) and the sender
 * (mail-sender.ts) delivers from there.
 */
import nodemailer from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { config } from '../core/config';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html?: string;
	/** A stable Message-ID, so that a message sent twice after a crash is recognisably one. */
	messageId?: string;
}

export interface Mailer {
	/** The app's origin, for Message-IDs only; links in messages use mailLink (config's ORIGIN). */
	origin: string;
	/** Resolves once the SMTP server has accepted the message. */
	send(mail: OutgoingMail): Promise<void>;
	close(): void;
}

export interface MailerOptions {
	/** An smtp:// or smtps:// URL, or nodemailer SMTP options. */
	transport: string | SMTPTransport.Options;
	from: string;
	origin: string;
}

/** Bounds on one delivery attempt, so a stalled server costs the sender a minute, not ten. */
const ATTEMPT_LIMITS = {
	connectionTimeout: 15_000,
	greetingTimeout: 15_000,
	socketTimeout: 60_000
};

/** SMTP options for the local catcher: plain TCP on the loopback interface, no TLS, no login. */
export function catcherTransport(port: number): SMTPTransport.Options {
	return { host: '127.0.0.1', port, secure: false, ignoreTLS: true };
}

export function createMailer({ transport, from, origin }: MailerOptions): Mailer {
	const options = typeof transport === 'string' ? { url: transport } : transport;
	const smtp = nodemailer.createTransport({
		...ATTEMPT_LIMITS,
		...options
	} as SMTPTransport.Options);
	return {
		origin,
		async send(mail) {
			await smtp.sendMail({ from, ...mail });
		},
		close: () => smtp.close()
	};
}

/** An absolute link into the app for an e-mail body; the one origin is the app's (ORIGIN). */
export const mailLink = (path: string): string => new URL(path, config().origin).href;
