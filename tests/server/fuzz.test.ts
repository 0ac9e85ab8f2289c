/**
 * Hostile requests to every mutating route and form action (targets in tests/fuzz/targets.ts),
 * against the built server: never a 5xx, a clear 4xx message for every refusal, and the
 * database exactly as before every refused request (checksum of every table).
 * FUZZ_RUNS (default 60) sets the runs per target; FUZZ_SEED replays a run.
 */
import Database from 'better-sqlite3';
import * as devalue from 'devalue';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { FUZZ_TARGETS, NOT_FUZZED, type FuzzFixtures, type FuzzRequest, type Who } from '../fuzz/targets';
import { routeFiles } from '../access/routes';
import { dbChecksum } from '../helpers/checksum';
import { Client, cleanup, DEMO_PEOPLE, ensureBuilt, freshDemoDb, signedIn, startServer, type Reply, type RunningServer } from '../helpers/server';

const PORT = 4263;
const RUNS = Number(process.env.FUZZ_RUNS ?? 60);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : undefined;
const name = (t: { route: string; method?: string; action?: string }) => `${t.route} ${t.action ? `?/${t.action}` : t.method}`;

test('every mutating route and form action is fuzzed, or says why not', () => {
	const mutating = routeFiles().flatMap((r) => [
		...r.methods.filter((m) => m !== 'GET' && m !== 'HEAD' && m !== 'OPTIONS').map((m) => `${r.id} ${m}`),
		...r.actions.map((a) => `${r.id} ?/${a}`)
	]);
	const covered = new Set(FUZZ_TARGETS.map(name));
	expect(mutating.filter((m) => !covered.has(m) && !(m in NOT_FUZZED))).toEqual([]);
	expect([...covered].filter((c) => !mutating.includes(c)), 'targets for routes that do not exist').toEqual([]);
});

describe('fuzzing the built server', () => {
	let server: RunningServer;
	let dir: string;
	let fixtures: FuzzFixtures;
	const clients = new Map<Who, Client>();
	let cases = 0;
	let resets = 0;

	beforeAll(async () => {
		await ensureBuilt();
		const db = await freshDemoDb();
		dir = db.dir;
		server = await startServer(db.file, PORT);
		for (const who of ['owner', 'lead', 'tech', 'office'] as const) clients.set(who, await signedIn(server.origin, who));
		clients.set('anon', new Client(server.origin));
		const created = await clients.get('owner')!.action('/admin/users?/create', {
			name: 'Fenna Rooke',
			email: 'fenna@corvidhill.example',
			role: 'tech',
			password: 'a long enough password'
		});
		expect(created.json().type).toBe('success');
		const conn = new Database(db.file, { readonly: true });
		const pluck = (sql: string) => conn.prepare(sql).pluck().all() as string[];
		fixtures = {
			origin: server.origin,
			// a spread of units: one per state, so that some hostile-looking requests are real moves
			serials: pluck(`select min(serial) from unit group by state, held order by 1`),
			stationCodes: pluck(`select code from station order by sort_order`),
			scrapReasons: pluck(`select code from scrap_reason`),
			victimId: pluck(`select id from user where email = 'fenna@corvidhill.example'`)[0],
			ownerId: pluck(`select id from user where email = '${DEMO_PEOPLE.owner.email}'`)[0],
			emails: [...Object.values(DEMO_PEOPLE).map((p) => p.email), 'fenna@corvidhill.example', 'nobody@corvidhill.example'],
			lotCodes: pluck(`select code from core_lot order by id`),
			modelCodes: pluck(`select code from turbo_model order by id`),
			orderIds: (conn.prepare(`select id from rebuild_order order by id`).pluck().all() as number[])
		};
		conn.close();
	}, 240_000);

	afterAll(async () => {
		for (const c of clients.values()) c.close();
		await server?.stop();
		if (dir) cleanup(dir);
		console.log(`fuzz: ${cases} hostile requests over ${FUZZ_TARGETS.length} targets (${resets} closed early by the server on an oversized body)`);
	});

	/** Tables the server's own background work writes whatever the requests do (the mail outbox sender). */
	const BACKGROUND_WRITES = ['outbox_message', 'dev_mail'];

	/** Short descriptions in failure reports instead of 70 kB bodies. */
	function described(req: FuzzRequest): FuzzRequest {
		const cut = (v: unknown) => (typeof v === 'string' && v.length > 120 ? `${v.slice(0, 120)}…(${v.length} chars)` : v);
		const text = JSON.stringify({ ...req, body: cut(req.body), fields: req.fields?.map(([k, v]) => [cut(k), cut(v)]) });
		return Object.assign({ ...req }, { [fc.toStringMethod]: () => text });
	}

	function send(c: Client, req: FuzzRequest): Promise<Reply> {
		if (req.kind === 'form') return c.action(req.path, new URLSearchParams(req.fields ?? []), req.headers);
		const headers: Record<string, string> = { origin: c.origin, ...req.headers };
		if (req.contentType) headers['content-type'] = req.contentType;
		return c.request((req.method ?? 'POST') as 'POST', req.path, { headers, body: req.body ?? '' });
	}

	/** Strings a person would read: under keys named message / error / errors, anywhere in the answer. */
	function messages(v: unknown, under = false, out: string[] = []): string[] {
		if (typeof v === 'string') {
			if (under) out.push(v);
		} else if (Array.isArray(v)) v.forEach((x) => messages(x, under, out));
		else if (v && typeof v === 'object') {
			for (const [k, x] of Object.entries(v)) messages(x, under || /^(message|error|errors|_errors)$|(Message|Error)$/.test(k), out);
		}
		return out;
	}

	function judge(r: Reply): { accepted: boolean; status: number; said: string[] } {
		const type = String(r.headers['content-type'] ?? '');
		if (type.includes('application/json')) {
			const j = r.json();
			if (j.type === 'success' || j.type === 'redirect') return { accepted: true, status: j.status ?? r.status, said: [] };
			if (j.type === 'failure') return { accepted: false, status: j.status, said: messages(devalue.parse(j.data)) };
			if (j.type === 'error') return { accepted: false, status: j.status ?? r.status, said: messages(j) };
			return { accepted: r.status < 400, status: r.status, said: messages(j) };
		}
		return { accepted: r.status < 400, status: r.status, said: [r.text.replace(/<[^>]+>/g, ' ').trim()] };
	}

	for (const target of FUZZ_TARGETS) {
		const runs = Math.max(1, Math.round(RUNS * (target.weight ?? 1)));
		test(`${name(target)} as ${target.as}: ${runs} hostile requests`, async () => {
			const c = clients.get(target.as)!;
			let before = dbChecksum(server.dbFile, [...(target.mayWrite ?? []), ...BACKGROUND_WRITES]);
			let refused = 0;
			await fc.assert(
				fc.asyncProperty(target.request(fixtures).map(described), async (req) => {
					cases++;
					let r: Reply;
					try {
						r = await send(c, req);
					} catch (e) {
						// The server may answer (e.g. 404 for a path no route matches) and close before reading a
						// large body; the client then sees a reset. Count it, and check nothing broke.
						if (!/ECONNRESET|EPIPE/.test(String((e as Error).message ?? e))) throw e;
						resets++;
						expect((await new Client(server.origin).get('/api/health')).status).toBe(200);
						expect(dbChecksum(server.dbFile, [...(target.mayWrite ?? []), ...BACKGROUND_WRITES])).toBe(before);
						return;
					}
					const v = judge(r);
					const after = dbChecksum(server.dbFile, [...(target.mayWrite ?? []), ...BACKGROUND_WRITES]);
					const what = `${String(req.path).slice(0, 120)} → ${r.status} ${r.text.slice(0, 300)}`;
					expect(r.status, what).toBeLessThan(500);
					if (v.accepted) {
						expect(v.status, what).toBeLessThan(400);
					} else {
						refused++;
						expect(v.status, what).toBeGreaterThanOrEqual(400);
						expect(v.status, what).toBeLessThan(500);
						const clear = v.said.filter((s) => /[A-Za-z]{3,}.*[A-Za-z]{3,}/s.test(s) && !/^(Unknown|Internal) Error$/.test(s));
						expect(clear.length, `a clear message for ${what}`).toBeGreaterThan(0);
						expect(after, `the database changed on a refused request: ${what}`).toBe(before);
					}
					before = after;
				}),
				{ numRuns: runs, seed: SEED, endOnFailure: true }
			);
			if (!target.mostlyValid) expect(refused, 'most hostile requests are refused').toBeGreaterThan(runs / 3);
			// the session used for fuzzing survived (no request signed it out by accident)
			if (target.as !== 'anon') expect((await c.get('/api/stations')).status).toBe(200);
		}, 300_000);
	}
});
