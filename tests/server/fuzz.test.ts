/**
 * Hostile requests to every mutating route and form action (targets in tests/fuzz/targets.ts,
 * vocabulary in tests/fuzz/vocabulary.ts), against the built server. Each target's requests are
 * its valid ones and, from them, one field broken at a time, unknown keys, deep nests, huge and
 * blank values, and bodies no client would send. For every request:
 *   - never a 5xx;
 *   - a refusal is a 4xx with a sentence a person can read, and leaves the database exactly as it
 *     was (no commit at all: `PRAGMA data_version` of a watching connection, which changes on any
 *     other connection's commit; a full checksum of every table for targets that write on refusal
 *     on purpose) and the uploads folder's file list as it was;
 *   - an accepted write is read back: every page and API that shows the touched record (unit page
 *     and its __data.json, print page and traveler, history API, the boards of its stations, its lot,
 *     its order and the customer's status page, the target's own pages) answers without a 5xx;
 *   - a blank where a target requires a number is refused, never read as 0;
 *   - a redirect stays on the site (except the payment checkout);
 *   - a webhook body altered after signing is refused.
 * FUZZ_PER_TARGET (default 200) sets the requests per target; FUZZ_SEED replays a run.
 * The server runs with mail off (no background writer) and a high status-link rate limit.
 */
import Database from 'better-sqlite3';
import * as devalue from 'devalue';
import fc from 'fast-check';
import { mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { loadavg } from 'node:os';
import { join } from 'node:path';
import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { FUZZ_TARGETS, NOT_FUZZED, type FuzzFixtures, type FuzzRequest, type FuzzTarget, type Who } from '../fuzz/targets';
import { routeFiles } from '../access/routes';
import { dbChecksum } from '../helpers/checksum';
import { fuzzFixtures, prepareFuzzShop, STAGE_OF_STATE, unitPlaces } from '../helpers/fuzz-shop';
import { Client, cleanup, ensureBuilt, freshDemoDb, signedIn, startServer, type Reply, type RunningServer } from '../helpers/server';

const PORT = 4263;
const PER_TARGET = Number(process.env.FUZZ_PER_TARGET ?? 200);
const SEED = process.env.FUZZ_SEED ? Number(process.env.FUZZ_SEED) : Math.floor(Math.random() * 2 ** 31);
const VICTIM = 'fenna@corvidhill.example';
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

interface Tally {
	target: string;
	sent: number;
	reached: number;
	accepted: number;
	pages: number;
	fivexx: number;
	findings: number;
	ms: number;
}

describe('fuzzing the built server', () => {
	let server: RunningServer;
	let dir: string;
	let uploads: string;
	let fixtures: FuzzFixtures;
	let watch: Database.Database;
	const clients = new Map<Who, Client>();
	const tallies: Tally[] = [];
	const started = Date.now();
	const cpuAtStart = process.cpuUsage();

	beforeAll(async () => {
		await ensureBuilt();
		const db = await freshDemoDb();
		dir = db.dir;
		uploads = join(dir, 'uploads');
		mkdirSync(uploads);
		const prepared = prepareFuzzShop(db.file);
		server = await startServer(db.file, PORT, { UPLOADS_DIR: uploads, MAIL_MODE: 'off', TRACK_RATE_LIMIT: '1000000' });
		for (const who of ['owner', 'lead', 'tech', 'office'] as const) clients.set(who, await signedIn(server.origin, who));
		clients.set('anon', new Client(server.origin));
		const created = await clients.get('owner')!.action('/admin/users?/create', { name: 'Fenna Rooke', email: VICTIM, role: 'tech', password: 'a long enough password' });
		expect(created.json().type).toBe('success');
		// a person only the sign-in target uses, and a lock for the owner to lift
		const gale = await clients.get('owner')!.action('/admin/users?/create', { name: 'Gale Ostrander', email: 'gale@corvidhill.example', role: 'office', password: 'another long password' });
		expect(gale.json().type).toBe('success');
		for (let i = 0; i < 5; i++) await new Client(server.origin).postForm('/login', { email: 'locked-out@corvidhill.example', password: 'wrong-password-1' });
		fixtures = await fuzzFixtures(db.file, server.origin, prepared, VICTIM);
		watch = new Database(db.file, { readonly: true, fileMustExist: true });
		console.log(`fuzz: seed ${SEED} (FUZZ_SEED=${SEED} replays it), ${PER_TARGET} requests per target`);
	}, 300_000);

	afterAll(async () => {
		watch?.close();
		for (const c of clients.values()) c.close();
		// the server's own CPU time (utime + stime in clock ticks of 1/100 s), read before it stops
		let serverCpu = 0;
		try {
			const stat = readFileSync(`/proc/${server.child.pid}/stat`, 'utf8').split(') ')[1].split(' ');
			serverCpu = (Number(stat[11]) + Number(stat[12])) / 100;
		} catch {
			/* not Linux */
		}
		await server?.stop();
		if (dir) cleanup(dir);
		const total = (k: keyof Omit<Tally, 'target'>) => tallies.reduce((s, t) => s + (t[k] as number), 0);
		const row = (t: Omit<Tally, 'target' | 'ms'> & { target: string; ms: number | string }) =>
			`${t.target.padEnd(62)} ${String(t.sent).padStart(5)} ${String(t.reached).padStart(7)} ${String(t.accepted).padStart(8)} ${String(t.pages).padStart(6)} ${String(t.fivexx).padStart(4)} ${String(t.findings).padStart(8)} ${String(t.ms).padStart(7)}`;
		const lines = [
			`${'target'.padEnd(62)} ${'sent'.padStart(5)} ${'reached'.padStart(7)} ${'accepted'.padStart(8)} ${'pages'.padStart(6)} ${'5xx'.padStart(4)} ${'findings'.padStart(8)} ${'ms'.padStart(7)}`,
			...tallies.map(row),
			row({ target: `TOTAL (${tallies.length} targets, seed ${SEED})`, sent: total('sent'), reached: total('reached'), accepted: total('accepted'), pages: total('pages'), fivexx: total('fivexx'), findings: total('findings'), ms: total('ms') })
		];
		const cpu = process.cpuUsage(cpuAtStart);
		console.log(`fuzz: CPU seconds: test process ${((cpu.user + cpu.system) / 1e6).toFixed(1)}, server ${serverCpu.toFixed(1)}; load average at the end ${loadavg().map((x) => x.toFixed(1)).join(' ')}`);
		console.log(`fuzz: per target (reached = answered other than a validation 400/413/415; pages = read-after-write pages checked)\n${lines.join('\n')}\nfuzz: ${((Date.now() - started) / 1000).toFixed(1)} s in all`);
	});

	/** Short descriptions in failure reports instead of megabyte bodies. */
	function describeReq(req: FuzzRequest): string {
		const cut = (v: unknown) => {
			const s = Buffer.isBuffer(v) ? v.toString('latin1') : String(v);
			return s.length > 160 ? `${s.slice(0, 160)}…(${s.length} chars)` : s;
		};
		const body = req.fields ? req.fields.map(([k, v]) => `${cut(k)}=${cut(v)}`).join('&') : cut(req.body ?? '');
		return `[${req.shape}] ${req.method ?? 'POST'} ${req.path.slice(0, 160)} ${req.contentType ?? (req.kind === 'form' ? 'form' : '')} ${body}`;
	}

	function sendWith(c: Client, req: FuzzRequest, extra: Record<string, string> = {}): Promise<Reply> {
		if (req.kind === 'form') return c.action(req.path, new URLSearchParams(req.fields ?? []), { ...req.headers, ...extra });
		const headers: Record<string, string> = { origin: c.origin, ...req.headers, ...extra };
		if (req.contentType) headers['content-type'] = req.contentType;
		return c.request(req.method ?? 'POST', req.path, { headers, body: req.body ?? '' });
	}

	/**
	 * Send as the person, each request on a connection of its own: a route that answers without
	 * reading the body (an action that takes no fields) leaves the rest of it on a kept-alive
	 * connection, and the next request there would wait and be reset.
	 */
	function send(c: Client, req: FuzzRequest): Promise<Reply> {
		return sendWith(c, req, { connection: 'close' });
	}

	/** Strings a person would read: under keys named message / error / errors, anywhere in the answer. */
	function messages(v: unknown, under = false, out: string[] = []): string[] {
		const stack: [unknown, boolean][] = [[v, under]];
		while (stack.length) {
			const [x, u] = stack.pop()!;
			if (typeof x === 'string') {
				if (u) out.push(x);
			} else if (Array.isArray(x)) x.forEach((y) => stack.push([y, u]));
			else if (x && typeof x === 'object') for (const [k, y] of Object.entries(x)) stack.push([y, u || /^(message|error|errors|_errors)$|(Message|Error)$/.test(k)]);
		}
		return out;
	}

	function judge(r: Reply): { accepted: boolean; status: number; said: string[]; location: string | null } {
		const type = String(r.headers['content-type'] ?? '');
		const location = r.headers.location ? String(r.headers.location) : null;
		if (type.includes('application/json')) {
			let j: any; // eslint-disable-line @typescript-eslint/no-explicit-any
			try {
				j = r.json();
			} catch {
				return { accepted: r.status < 400, status: r.status, said: [r.text], location };
			}
			if (j?.type === 'success') return { accepted: true, status: j.status ?? r.status, said: [], location };
			if (j?.type === 'redirect') return { accepted: true, status: j.status ?? r.status, said: [], location: String(j.location) };
			if (j?.type === 'failure') return { accepted: false, status: j.status, said: messages(devalue.parse(j.data)), location };
			if (j?.type === 'error') return { accepted: false, status: j.status ?? r.status, said: messages(j), location };
			return { accepted: r.status < 400, status: r.status, said: messages(j), location };
		}
		return { accepted: r.status < 400, status: r.status, said: [r.text.replace(/<[^>]+>/g, ' ').trim()], location };
	}

	/** A redirect target a browser would open on this site. */
	function sameSite(location: string): boolean {
		if (/[\\\u0000-\u001f]/.test(location)) return false;
		try {
			return new URL(location, server.origin).origin === server.origin;
		} catch {
			return false;
		}
	}

	/** The last error the server logged: its message line and the two lines under it. */
	function lastError(log: string): string {
		const lines = log.split('\n');
		for (let i = lines.length - 1; i >= 0; i--) {
			if (/^\S.*(Error|error)/.test(lines[i])) return lines.slice(i, i + 3).map((l) => l.trim().slice(0, 200)).join(' | ');
		}
		return log.slice(-300).replace(/\s+/g, ' ');
	}

	function uploadList(): string {
		return (readdirSync(uploads, { recursive: true }) as string[]).sort().join('\n');
	}

	function dataVersion(): number {
		return watch.pragma('data_version', { simple: true }) as number;
	}

	type Page = { url: string; as: Who };

	/**
	 * Every page and API that shows what the request touched: `own` are the touched record's own
	 * pages (the unit page, its data, print page and history; the order and status page acted on;
	 * the target's own pages); `lists` are the pages that list it among others (its lot, the boards
	 * of its stations, its customer order and status page).
	 */
	function pagesFor(t: FuzzTarget, req: FuzzRequest, r: Reply, location: string | null): { own: Page[]; lists: Page[] } {
		const text = `${req.path}\n${req.fields?.map(([k, v]) => `${k}=${v.slice(0, 4000)}`).join('\n') ?? ''}\n${Buffer.isBuffer(req.body) ? '' : String(req.body ?? '').slice(0, 4000)}\n${r.text.slice(0, 4000)}\n${location ?? ''}`;
		const serials = [...new Set(text.match(/SY-\d{5}/g) ?? [])].slice(0, 6);
		const own: Page[] = [];
		const lists: Page[] = [];
		const places = unitPlaces(watch, serials);
		const orders = new Set<number>();
		const lots = new Set<string>();
		const boards = new Set<string>();
		for (const [s, p] of places) {
			for (const url of [`/units/${s}`, `/units/${s}/__data.json`, `/units/${s}/print`, `/api/units/${s}`]) own.push({ url, as: 'owner' });
			lots.add(p.lotCode);
			if (p.orderId) orders.add(p.orderId);
			if (p.lastStation) boards.add(p.lastStation);
			const stage = STAGE_OF_STATE[p.state];
			if (stage && fixtures.stations[stage]?.[0]) boards.add(fixtures.stations[stage][0]);
		}
		const orderPages = (id: number, into: Page[]) => {
			into.push({ url: `/orders/${id}`, as: 'owner' });
			const i = fixtures.liveOrderIds.indexOf(id);
			if (i >= 0) into.push({ url: `/track/${fixtures.tokens[i]}`, as: 'anon' });
		};
		for (const id of orders) orderPages(id, lists);
		for (const m of `${req.path}\n${location ?? ''}`.matchAll(/\/orders\/(\d{1,9})\b/g)) orderPages(Number(m[1]), own);
		const token = /^\/track\/([^/?]+)/.exec(req.path)?.[1];
		if (token && fixtures.tokens.includes(token)) orderPages(fixtures.liveOrderIds[fixtures.tokens.indexOf(token)], own);
		for (const m of req.path.matchAll(/^\/lots\/([^/?]+)/g)) own.push({ url: `/lots/${m[1]}`, as: 'owner' });
		for (const m of (location ?? '').matchAll(/^\/lots\/([^/?]+)/g)) own.push({ url: `/lots/${m[1]}`, as: 'owner' });
		for (const code of lots) lists.push({ url: `/lots/${encodeURIComponent(code)}`, as: 'owner' });
		for (const code of boards) lists.push({ url: `/api/stations/${code}/board`, as: 'owner' });
		for (const url of t.shows?.(fixtures) ?? []) own.push({ url, as: 'owner' });
		return { own, lists };
	}

	/** GET the pages, four at a time; the ones that answered 5xx, with their answers. */
	let pageMs = 0;
	async function open(pages: Page[]): Promise<{ page: Page; reply: Reply }[]> {
		const t = Date.now();
		try {
			return await openPages(pages);
		} finally {
			pageMs += Date.now() - t;
		}
	}
	async function openPages(pages: Page[]): Promise<{ page: Page; reply: Reply }[]> {
		const bad: { page: Page; reply: Reply }[] = [];
		for (let i = 0; i < pages.length; i += 4) {
			const replies = await Promise.all(pages.slice(i, i + 4).map((p) => clients.get(p.as)!.get(p.url)));
			replies.forEach((reply, j) => reply.status >= 500 && bad.push({ page: pages[i + j], reply }));
		}
		return bad;
	}

	const label = (p: Page) => `${p.url.replace(/SY-\d{5}/, 'SY-…').replace(/\/track\/[^/]+/, '/track/TOKEN').replace(/\/lots\/[^/?]+/, '/lots/CODE').replace(/\/orders\/\d+/, '/orders/ID').replace(/stations\/[^/]+/, 'stations/CODE')} as ${p.as}`;
	/** Pages seen answering 5xx, with the target that first broke them: a later write to the same record says so. */
	const broken = new Map<string, string>();
	const brokenBefore = (p: Page, target: string) => {
		const first = broken.get(p.url);
		if (!first) broken.set(p.url, target);
		return first ? ` (the page was already broken by an earlier write${first === target ? '' : ` of ${first}`})` : '';
	};
	const runs = (t: FuzzTarget) => Math.max(1, Math.round(PER_TARGET * (t.weight ?? 1)));
	FUZZ_TARGETS.forEach((target, index) => {
		test(`${name(target)} as ${target.as}: ${runs(target)} requests`, async () => {
			const t0 = Date.now();
			const c = clients.get(target.as)!;
			const ladder = target.ladder?.(fixtures, SEED + index) ?? [];
			const requests = [...ladder, ...fc.sample(target.request(fixtures), { numRuns: Math.max(0, runs(target) - ladder.length), seed: SEED + index })];
			const generated = Date.now() - t0;
			pageMs = 0;
			const tally: Tally = { target: `${name(target)} as ${target.as}`, sent: 0, reached: 0, accepted: 0, pages: 0, fivexx: 0, findings: 0, ms: 0 };
			tallies.push(tally);
			/** Findings, each once with how often it came up. */
			const findings = new Map<string, { count: number; example: string }>();
			const find = (kind: string, example: string) => {
				const f = findings.get(kind) ?? { count: 0, example };
				f.count++;
				findings.set(kind, f);
			};
			/** Pages to open once at the end of the target, with (up to three of) the writes that touched them. */
			const deferred = new Map<string, { page: Page; writes: string[] }>();
			/** Answers by request shape and status, printed with FUZZ_DEBUG=1. */
			const histogram = new Map<string, number>();
			const spent = new Map<string, number>();
			/**
			 * Did a commit land since `version`? Any commit at all, for most targets; for a target that
			 * writes some tables on refusal on purpose, a change in the checksum of all the other tables
			 * (computed only when a commit landed; the last one is kept with the version it was made at).
			 */
			let kept: { version: number; sum: string } | null = null;
			const sumNow = () => {
				const v = dataVersion();
				if (kept?.version !== v) kept = { version: v, sum: dbChecksum(server.dbFile, target.mayWrite ?? []) };
				return kept.sum;
			};
			const changedSince = (version: number, sum: string | null) => (target.mayWrite ? dataVersion() !== version && sumNow() !== sum : dataVersion() !== version);
			for (const req of requests) {
				tally.sent++;
				const t1 = Date.now();
				const version = dataVersion();
				const files = uploadList();
				const sum = target.mayWrite ? sumNow() : null;
				spent.set('pre', (spent.get('pre') ?? 0) + Date.now() - t1);
				let r: Reply;
				try {
					r = await send(c, req);
				} catch (e) {
					// The server may answer (e.g. 413 or 404) and close before reading a large body; the client then
					// sees a reset. That is a refusal: the server must still be up and nothing may have changed.
					if (!/ECONNRESET|EPIPE/.test(String((e as Error).message ?? e))) throw e;
					spent.set('reset', (spent.get('reset') ?? 0) + Date.now() - t1);
					if (process.env.FUZZ_DEBUG) console.log(`reset after ${Date.now() - t1} ms: ${String((e as Error).message)} ${describeReq(req).slice(0, 300)}\nserver log: ${server.log().slice(-1500)}`);
					histogram.set(`${req.shape.split(':')[0]} reset`, (histogram.get(`${req.shape.split(':')[0]} reset`) ?? 0) + 1);
					expect((await new Client(server.origin).get('/api/health')).status).toBe(200);
					if (changedSince(version, sum)) find('database changed on a request the server cut off', describeReq(req));
					continue;
				}
				const v = judge(r);
				const h = `${req.shape.split(':')[0]} ${v.status}`;
				histogram.set(h, (histogram.get(h) ?? 0) + 1);
				spent.set(req.shape.split(':')[0], (spent.get(req.shape.split(':')[0]) ?? 0) + Date.now() - t1);
				const t2 = Date.now();
				const what = `${describeReq(req)} → ${r.status} ${r.text.slice(0, 200)}`;
				if (r.status >= 500 || v.status >= 500) {
					tally.fivexx++;
					find(`${v.status} from the request itself [${req.shape.split(':')[0]}]`, `${what}\n   server log: ${lastError(server.log())}`);
					continue;
				}
				if (![400, 413, 415].includes(v.status)) tally.reached++;
				if (v.location && !target.offsite && !sameSite(v.location)) find(`redirect off the site: ${v.location.slice(0, 80)}`, what);
				if (req.mustRefuse && v.accepted) find(`accepted what must be refused (${req.mustRefuse})`, what);
				if (v.accepted) {
					if (v.status >= 400) find('a success answer with an error status', what);
					tally.accepted++;
					const blank = /^blank:(.+)$/.exec(req.shape)?.[1];
					if (blank && target.requiredNumbers?.includes(blank)) find(`a blank ${blank} was accepted (read as a number)`, what);
					// a hostile write: its record's own pages now; a valid one's, and every list that shows the record, once at the end
					const { own, lists } = pagesFor(target, req, r, v.location);
					const now = req.shape === 'valid' ? [] : own;
					for (const p of [...(req.shape === 'valid' ? own : []), ...lists]) {
						const k = `${p.as} ${p.url}`;
						const d = deferred.get(k) ?? { page: p, writes: [] };
						if (d.writes.length < 3) d.writes.push(what);
						deferred.set(k, d);
					}
					tally.pages += now.length;
					for (const { page, reply } of await open(now)) {
						tally.fivexx++;
						find(`read-after-write: ${label(page)} → ${reply.status}${brokenBefore(page, tally.target)}`, `${what}\n   then GET ${page.url} → ${reply.status} ${reply.text.replace(/\s+/g, ' ').slice(0, 200)}`);
					}
				} else {
					if (v.status < 400 || v.status >= 500) find(`a refusal with status ${v.status}`, what);
					const clear = v.said.filter((s) => {
						const words = s.match(/[A-Za-z]+/g) ?? [];
						return words.length >= 2 && words.some((w) => w.length >= 3) && !/^(Unknown|Internal) Error$/.test(s.trim());
					});
					if (!clear.length) find('a refusal without a sentence', what);
					if (changedSince(version, sum)) find('the database changed on a refused request', what);
					if (uploadList() !== files) find('the uploads folder changed on a refused request', what);
				}
				spent.set('post', (spent.get('post') ?? 0) + Date.now() - t2);
			}
			const later = [...deferred.values()];
			tally.pages += later.length;
			for (const { page, reply } of await open(later.map((d) => d.page))) {
				tally.fivexx++;
				find(`read-after-write: ${label(page)} → ${reply.status}${brokenBefore(page, tally.target)}`, `${deferred.get(`${page.as} ${page.url}`)!.writes.join('\n   or ')}\n   then GET ${page.url} → ${reply.status} ${reply.text.replace(/\s+/g, ' ').slice(0, 200)}`);
			}
			tally.findings = [...findings.values()].reduce((s, f) => s + f.count, 0);
			tally.ms = Date.now() - t0;
			const report = [...findings].map(([kind, f]) => `${f.count} × ${kind}\n   e.g. ${f.example}`);
			if (process.env.FUZZ_DEBUG) console.log(`fuzz answers for ${tally.target}: ${[...histogram].sort().map(([k, n]) => `${k}×${n}`).join(', ')}; generated in ${generated} ms; pages ${pageMs} ms; all ${Date.now() - t0} ms; ms by shape ${[...spent].map(([k, n]) => `${k} ${n}`).join(', ')}`);
			if (report.length) console.log(`fuzz findings for ${tally.target}:\n${report.join('\n')}`);
			expect(report, `findings (FUZZ_SEED=${SEED} replays)`).toEqual([]);
			// valid requests get past validation: a share of every target reaches the service
			expect(tally.reached, 'requests that reached the service').toBeGreaterThan(0);
			// the session used for fuzzing survived (no request signed it out by accident)
			const still = target.as === 'anon' ? 'no session to keep' : (await c.get('/api/stations')).status;
			expect(still).toBe(target.as === 'anon' ? 'no session to keep' : 200);
		}, 600_000);
	});
});
