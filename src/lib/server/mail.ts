/**
 * Outgoing mail through nodemailer: a real SMTP server when SMTP_URL is set, otherwise the local
 * mail catcher (src/lib/server/mail-catcher.ts), which nodemailer reaches over TCP like any other.
 */
import nodemailer from 'nodemailer';
import type SMTPTransport from 'nodemailer/lib/smtp-transport';
import { renderTemplate, type MailTemplate } from './templates';

export interface OutgoingMail {
	to: string;
	subject: string;
	text: string;
	html?: string;
}

export interface Mailer {
	/** Public base URL of the app, for links in messages. */
	origin: string;
	send(mail: OutgoingMail): Promise<void>;
	close(): void;
}

export interface MailerOptions {
	/** An smtp:// or smtps:// URL, or nodemailer SMTP options. */
	transport: string | SMTPTransport.Options;
	from: string;
	origin: string;
}

/** SMTP options for the local catcher: plain TCP on the loopback interface, no TLS, no login. */
export function catcherTransport(port: number): SMTPTransport.Options {
	return { host: '127.0.0.1', port, secure: false, ignoreTLS: true };
}

export function createMailer({ transport, from, origin }: MailerOptions): Mailer {
	const smtp = nodemailer.createTransport(transport as SMTPTransport.Options);
	return {
		origin,
		async send(mail) {
			await smtp.sendMail({ from, ...mail });
		},
		close: () => smtp.close()
	};
}

/** An absolute link into the app for an e-mail body. */
export const mailLink = (mailer: Mailer, path: string): string => new URL(path, mailer.origin).href;

/**
 * Renders a template and sends it. A failed delivery is logged, not thrown: the action that
 * caused it has already happened, and every message here can be asked for again.
 */
export async function sendTemplate(
	mailer: Mailer,
	to: string,
	template: MailTemplate,
	values: Record<string, string>
): Promise<boolean> {
	const { subject, text } = renderTemplate(template, values);
	try {
		await mailer.send({ to, subject, text });
		return true;
	} catch (error) {
		console.error(`mail: could not send "${template}" to ${to}:`, error);
		return false;
	}
}
