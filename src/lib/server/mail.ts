/**
 * Outgoing e-mail: nodemailer with SMTP settings from the environment, or — in dev, demo
 * and tests — a local SMTP fake (the `smtp-server` package on 127.0.0.1) that stores every
 * message it accepts in `dev_mail`. The fake speaks real SMTP; nothing is mocked.
 */
import nodemailer, { type Transporter } from 'nodemailer';
import { SMTPServer } from 'smtp-server';
import { simpleParser } from 'mailparser';
import type { AddressInfo } from 'node:net';
import type { Db } from './db';
import { devMail } from './db/schema';

export type MailMode = 'fake' | 'smtp' | 'off';

export interface MailConfig {
	mode: MailMode;
	from: string;
	smtp: { host: string; port: number; secure: boolean; user?: string; pass?: string };
	fakePort: number;
}

export function mailConfig(env: Record<string, string | undefined> = process.env): MailConfig {
	const explicit = env.MAIL_MODE as MailMode | undefined;
	const mode: MailMode = explicit === 'smtp' || explicit === 'off' || explicit === 'fake' ? explicit : env.SMTP_HOST ? 'smtp' : 'fake';
	return {
		mode,
		from: env.MAIL_FROM ?? 'Spoolyard <no-reply@spoolyard.invalid>',
		smtp: {
			host: env.SMTP_HOST ?? '127.0.0.1',
			port: Number(env.SMTP_PORT ?? 587),
			secure: env.SMTP_SECURE === '1',
			user: env.SMTP_USER || undefined,
			pass: env.SMTP_PASS || undefined
		},
		fakePort: Number(env.SMTP_FAKE_PORT ?? 0)
	};
}

export interface SmtpFake {
	port: number;
	close(): Promise<void>;
}

/** The local SMTP fake: binds only to 127.0.0.1, no auth needed, no STARTTLS. */
export async function startSmtpFake(db: Db, port = 0): Promise<SmtpFake> {
	const server = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		secure: false,
		logger: false,
		size: 5 * 1024 * 1024,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('end', async () => {
				try {
					const raw = Buffer.concat(chunks).toString('utf8');
					const parsed = await simpleParser(raw);
					db.insert(devMail)
						.values({
							mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
							rcptTo: session.envelope.rcptTo.map((r) => r.address).join(', '),
							subject: parsed.subject ?? '',
							raw,
							receivedAt: new Date()
						})
						.run();
					callback();
				} catch (e) {
					callback(e instanceof Error ? e : new Error(String(e)));
				}
			});
		}
	});
	await new Promise<void>((resolve, reject) => {
		server.once('error', reject);
		server.listen(port, '127.0.0.1', () => resolve());
	});
	const address = server.server.address() as AddressInfo;
	return {
		port: address.port,
		close: () => new Promise<void>((resolve) => server.close(() => resolve()))
	};
}

export function smtpTransport(config: MailConfig, fakePort?: number): Transporter {
	if (config.mode === 'fake') {
		return nodemailer.createTransport({ host: '127.0.0.1', port: fakePort, secure: false, ignoreTLS: true });
	}
	return nodemailer.createTransport({
		host: config.smtp.host,
		port: config.smtp.port,
		secure: config.smtp.secure,
		auth: config.smtp.user ? { user: config.smtp.user, pass: config.smtp.pass ?? '' } : undefined
	});
}
