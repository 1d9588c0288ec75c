import nodemailer from 'nodemailer';
import { setting } from './config';

/** SMTP settings from the environment: the local fake server in development, a real provider in production. */
export function smtpSettings() {
	return {
		host: setting('SMTP_HOST') ?? '127.0.0.1',
		port: Number(setting('SMTP_PORT') ?? 2525),
		secure: setting('SMTP_SECURE') === 'true',
		auth: setting('SMTP_USER')
			? { user: setting('SMTP_USER'), pass: setting('SMTP_PASSWORD') ?? '' }
			: undefined,
		// The local fake server has no certificate; a real provider is reached with STARTTLS when offered.
		ignoreTLS: (setting('SMTP_HOST') ?? '127.0.0.1') === '127.0.0.1',
		connectionTimeout: 5000,
		greetingTimeout: 5000,
		socketTimeout: 10000
	};
}

export function mailFrom(): string {
	return setting('MAIL_FROM') ?? 'Envelo <no-reply@envelo.example.test>';
}

export function createTransport() {
	return nodemailer.createTransport(smtpSettings());
}

export type OutgoingMail = {
	to: string;
	subject: string;
	text: string;
	html?: string;
	attachments?: { filename: string; content: Buffer; contentType?: string }[];
};

/**
 * Text made safe inside HTML, for element content and quoted attribute values alike: every character
 * that could open a tag, an entity or end an attribute is written as an entity. Whatever a dwelling,
 * a person or a message is called, it comes out in an HTML e-mail as text.
 */
export function escapeHtml(text: string): string {
	return text.replace(
		/[&<>"']/g,
		(c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!
	);
}

/** Send now. Callers that must never lose a message go through the outbox instead. */
export async function sendMail(message: OutgoingMail): Promise<void> {
	const transport = createTransport();
	try {
		await transport.sendMail({ from: mailFrom(), ...message });
	} finally {
		transport.close();
	}
}
