/**
 * The one window a transactional outbox cannot close: the SMTP server has accepted a message
 * (its 250 reply is on the wire) and the app dies before it marks the outbox row sent. The
 * built server sends through a local SMTP server run by this test; when the message's data
 * has arrived, the test freezes the app process (SIGSTOP, and waits until the kernel reports it
 * stopped), sends the 250 reply, and kills the app with SIGKILL. So the crash lands in the
 * window every time, not by luck of timing. After a restart the message is delivered again —
 * at least once — with the same Message-ID, which is what lets a mail client drop the copy.
 */
import { readFileSync } from 'node:fs';
import { setTimeout as sleep } from 'node:timers/promises';
import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import type { AddressInfo } from 'node:net';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { openDatabase } from '../../src/lib/server/db/index';
import { cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type RunningServer } from '../helpers/server';

const PORT = 4276;
const LEASE_MS = 1500;

interface Received {
	messageId: string;
	subject: string;
	text: string;
	to: string;
	raw: string;
}

let dir: string;
let file: string;
let server: RunningServer | undefined;
let smtp: SMTPServer;
let smtpPort: number;
const received: Received[] = [];
/** What the SMTP server does once a message's data is in: accept it, or crash the app first. */
let onMessage: 'accept' | 'crash-app' = 'accept';
let crashed: Promise<void> | null = null;

/** Linux: a process's state letter from /proc (T = stopped). */
const procState = (pid: number) => /^\d+ \(.*\) (\S)/.exec(readFileSync(`/proc/${pid}/stat`, 'utf8'))?.[1];

async function freezeThenKill(app: RunningServer, reply: () => void) {
	const pid = app.child.pid!;
	process.kill(pid, 'SIGSTOP');
	const until = Date.now() + 5000;
	while (procState(pid) !== 'T') {
		if (Date.now() > until) throw new Error(`the app (pid ${pid}) did not stop`);
		await sleep(5);
	}
	reply(); // the 250: the SMTP server has accepted the message; the app cannot read it any more
	await sleep(50);
	await app.kill9();
}

function mailEnv(): Record<string, string> {
	return {
		MAIL_MODE: 'smtp',
		SMTP_HOST: '127.0.0.1',
		SMTP_PORT: String(smtpPort),
		OUTBOX_POLL_MS: '100',
		OUTBOX_LEASE_MS: String(LEASE_MS)
	};
}

beforeAll(async () => {
	await ensureBuilt();
	({ dir, file } = await freshDemoDb());
	smtp = new SMTPServer({
		authOptional: true,
		disabledCommands: ['STARTTLS', 'AUTH'],
		secure: false,
		logger: false,
		onData(stream, session, callback) {
			const chunks: Buffer[] = [];
			stream.on('data', (c: Buffer) => chunks.push(c));
			stream.on('end', async () => {
				const raw = Buffer.concat(chunks).toString('utf8');
				const parsed = await simpleParser(raw);
				received.push({
					messageId: parsed.messageId ?? '',
					subject: parsed.subject ?? '',
					text: parsed.text ?? '',
					to: session.envelope.rcptTo.map((r) => r.address).join(', '),
					raw
				});
				if (onMessage === 'crash-app' && server && !crashed) {
					crashed = freezeThenKill(server, () => callback());
					return;
				}
				callback();
			});
		}
	});
	await new Promise<void>((resolve, reject) => {
		smtp.once('error', reject);
		smtp.listen(0, '127.0.0.1', () => resolve());
	});
	smtpPort = (smtp.server.address() as AddressInfo).port;
}, 300_000);

afterAll(async () => {
	await server?.stop();
	await new Promise<void>((resolve) => smtp?.close(() => resolve()));
	if (dir) cleanup(dir);
});

function outboxRows() {
	const db = openDatabase(file, { migrate: false });
	try {
		return db.$client.prepare(`select id, status, attempts, created_at as createdAt, to_address as toAddress from outbox_message order by id`).all() as {
			id: number;
			status: string;
			attempts: number;
			createdAt: number;
			toAddress: string;
		}[];
	} finally {
		db.$client.close();
	}
}

test('a crash after the SMTP server accepted a message and before the outbox marked it sent: delivered again, same Message-ID', async () => {
	server = await startServer(file, PORT, mailEnv());
	// the demo's queued e-mails go out first, normally: each once, each marked sent
	const queued = outboxRows().length;
	expect(queued).toBeGreaterThan(0);
	await expect.poll(() => outboxRows().filter((r) => r.status === 'sent').length, { timeout: 15_000 }).toBe(queued);
	expect(received).toHaveLength(queued);

	// now an order's e-mail is accepted by the SMTP server while the app dies before recording it
	onMessage = 'crash-app';
	const office = await signedIn(server.origin, 'office');
	const email = 'crash-window@customer.example';
	const r = await office.postForm('/orders?/create', {
		customerName: 'Hollis Brandt',
		email,
		phone: '',
		shipAddress: '4 Quarry Row, Pellmarsh',
		modelCode: 'CH-V55',
		originalTag: 'HB-1',
		complaint: 'Whistles under boost.',
		promisedOn: '',
		notifyReceived: 'on'
	});
	office.close();
	expect(r.status, r.text.slice(0, 300)).toBe(303);
	await expect.poll(() => crashed !== null, { timeout: 10_000 }).toBe(true);
	await crashed;
	expect(server.child.signalCode).toBe('SIGKILL');

	const first = received.filter((m) => m.to === email);
	expect(first).toHaveLength(1);
	const row = outboxRows().find((x) => x.toAddress === email)!;
	// the honest state after the crash: the SMTP server has the message, the outbox does not know it
	expect(row).toMatchObject({ status: 'sending', attempts: 1 });
	expect(first[0].messageId).toBe(`<outbox-${row.id}.${row.createdAt}@spoolyard.invalid>`);

	// restart: once the lease has run out the message is sent again, with the same Message-ID
	onMessage = 'accept';
	server = await startServer(file, PORT, mailEnv());
	await expect.poll(() => received.filter((m) => m.to === email).length, { timeout: LEASE_MS + 15_000 }).toBe(2);
	await expect.poll(() => outboxRows().find((x) => x.id === row.id)?.status, { timeout: 5000 }).toBe('sent');
	const copies = received.filter((m) => m.to === email);
	expect(copies.map((m) => m.messageId)).toEqual([first[0].messageId, first[0].messageId]);
	expect(copies[1].subject).toBe(copies[0].subject);
	expect(copies[1].text).toBe(copies[0].text);
	expect(outboxRows().find((x) => x.id === row.id)).toMatchObject({ status: 'sent', attempts: 2 });
	// nothing else was sent twice
	const ids = received.map((m) => m.messageId);
	expect(ids.filter((id, i) => ids.indexOf(id) !== i)).toEqual([first[0].messageId]);
	await server.stop();
}, 300_000);
