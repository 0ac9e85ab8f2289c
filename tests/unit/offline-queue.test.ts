import fc from 'fast-check';
import { expect, test } from 'vitest';
import { replayQueue, verdict, waitingWords, type QueuedScan, type SendAnswer } from '../../src/lib/client/offline-queue';

const scanAt = (i: number, serial = `SY-${String(10000 + i)}`): QueuedScan => ({
	key: `scan:k${i}`,
	serial,
	stationCode: 'WASH',
	at: new Date(Date.UTC(2026, 11, 2, 7, 0, i)).toISOString()
});

test('each answer is sorted into sent, keep waiting or needs the tech', () => {
	// Source: RFC 9110 §15 status classes — 2xx success; 408/429 and 5xx are worth trying again later;
	// 401 means the sign-in lapsed (the scan is kept until the tech signs in again); other 4xx are refusals.
	expect(verdict({ kind: 'network' })).toBe('keep');
	expect(verdict({ kind: 'http', status: 201, message: '' })).toBe('sent');
	expect(verdict({ kind: 'http', status: 200, message: '' })).toBe('sent');
	for (const s of [401, 408, 429, 500, 502, 503]) expect(verdict({ kind: 'http', status: s, message: '' })).toBe('keep');
	for (const s of [400, 403, 404, 409, 422]) expect(verdict({ kind: 'http', status: s, message: 'no' })).toBe('attention');
});

test('the queue is sent oldest first; a refusal is kept for the tech; a lost link stops the run', async () => {
	const sent: string[] = [];
	const queue = [scanAt(3), scanAt(1), scanAt(2), scanAt(4)];
	const answers: Record<string, SendAnswer> = {
		'scan:k1': { kind: 'http', status: 201, message: '' },
		'scan:k2': { kind: 'http', status: 409, message: 'SY-10002 is on hold.' },
		'scan:k3': { kind: 'network' }
	};
	const settled: string[] = [];
	const r = await replayQueue(
		queue,
		async (q) => {
			sent.push(q.key);
			return answers[q.key] ?? { kind: 'http', status: 201, message: '' };
		},
		(q, v) => void settled.push(`${q.key}:${v}`)
	);
	expect(sent).toEqual(['scan:k1', 'scan:k2', 'scan:k3']);
	expect(r.sent.map((q) => q.key)).toEqual(['scan:k1']);
	expect(r.attention).toEqual([{ ...scanAt(2), status: 409, message: 'SY-10002 is on hold.' }]);
	expect(r.kept.map((q) => q.key)).toEqual(['scan:k3', 'scan:k4']);
	expect(settled).toEqual(['scan:k1:sent', 'scan:k2:attention']);
});

test('a sender that throws counts as no link', async () => {
	const r = await replayQueue([scanAt(1)], async () => {
		throw new TypeError('Failed to fetch');
	});
	expect(r).toEqual({ sent: [], attention: [], kept: [scanAt(1)] });
});

test('property: nothing is lost or doubled, the order holds, and what waits is the tail of the queue', async () => {
	// Source: the queue's own contract (no outside reference applies): every scan ends in exactly one list.
	const answer = fc.oneof(
		fc.constant<SendAnswer>({ kind: 'network' }),
		fc.constantFrom(200, 201, 401, 404, 409, 429, 500).map<SendAnswer>((status) => ({ kind: 'http', status, message: `status ${status}` }))
	);
	await fc.assert(
		fc.asyncProperty(fc.array(answer, { maxLength: 30 }), async (answers) => {
			const queue = answers.map((_, i) => scanAt(i)).reverse();
			const calls: number[] = [];
			const r = await replayQueue(queue, async (q) => {
				const i = Number(q.key.slice(6));
				calls.push(i);
				return answers[i];
			});
			const all = [...r.sent, ...r.attention, ...r.kept].map((q) => q.key).sort();
			expect(all).toEqual(queue.map((q) => q.key).sort());
			expect(calls).toEqual([...calls].sort((a, b) => a - b));
			const firstKept = r.kept.length ? Number(r.kept[0].key.slice(6)) : answers.length;
			expect(r.kept.map((q) => q.key)).toEqual(answers.slice(firstKept).map((_, j) => `scan:k${firstKept + j}`));
			expect(r.sent.length + r.attention.length).toBe(firstKept);
		}),
		{ numRuns: 300 }
	);
});

test('the board counts waiting scans in words', () => {
	expect(waitingWords(1)).toBe('1 scan waiting to send');
	expect(waitingWords(3)).toBe('3 scans waiting to send');
});
