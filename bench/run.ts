/**
 * The shop-scale benchmark: seeds a large database, starts the built server on 127.0.0.1,
 * drives it with autocannon and prints a table (also written to bench/results.json).
 *
 *   npm run bench                 seed (unless bench/bench.db exists and --reuse), build if needed, run
 *   npm run bench -- --reuse      keep an existing bench/bench.db
 *   BENCH_SECONDS=5 npm run bench shorter runs
 */
import autocannon from 'autocannon';
import Database from 'better-sqlite3';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import { existsSync, readFileSync, writeFileSync, statSync } from 'node:fs';
import { randomUUID } from 'node:crypto';
import { cpus } from 'node:os';
import { gzipSync } from 'node:zlib';
import { seedLarge } from './seed';

const FILE = process.env.BENCH_DB ?? 'bench/bench.db';
const PORT = Number(process.env.BENCH_PORT ?? 4310);
const ORIGIN = `http://localhost:${PORT}`;
const BASE = `http://127.0.0.1:${PORT}`;
const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const TECH = { email: 'rui@corvidhill.example', password: 'tech-demo-2026' };
const OWNER = { email: 'ines@corvidhill.example', password: 'owner-demo-2026' };

interface Row {
	name: string;
	connections: number;
	rps: number;
	p50: number;
	p95: number;
	p99: number;
	non2xx: number;
	errors: number;
	note?: string;
}

function percentile(sorted: number[], p: number): number {
	if (!sorted.length) return NaN;
	const i = Math.min(sorted.length - 1, Math.max(0, Math.ceil((p / 100) * sorted.length) - 1));
	return sorted[i];
}

async function waitUp(): Promise<void> {
	for (let i = 0; i < 200; i++) {
		try {
			const r = await fetch(`${BASE}/api/health`);
			if (r.ok) return;
		} catch {
			/* not yet */
		}
		await new Promise((r) => setTimeout(r, 100));
	}
	throw new Error('server did not start');
}

async function signIn(who: { email: string; password: string }): Promise<string> {
	const r = await fetch(`${BASE}/login`, {
		method: 'POST',
		redirect: 'manual',
		headers: { 'content-type': 'application/x-www-form-urlencoded', origin: ORIGIN },
		body: new URLSearchParams(who).toString()
	});
	const cookie = r.headers.getSetCookie().find((c) => c.startsWith('sy_session='));
	if (!cookie) throw new Error(`sign-in failed for ${who.email}: ${r.status}`);
	return cookie.split(';')[0];
}

async function run(
	name: string,
	connections: number,
	opts: Partial<autocannon.Options> & { path?: string },
	note?: string
): Promise<Row> {
	const times: number[] = [];
	const { path, ...rest } = opts;
	const inst = autocannon({ url: `${BASE}${path ?? ''}`, connections, duration: SECONDS, ...rest } as autocannon.Options);
	inst.on('response', (_c: unknown, _s: number, _b: number, rt: number) => times.push(rt));
	const res = await inst;
	times.sort((a, b) => a - b);
	return {
		name,
		connections,
		rps: Math.round(res.requests.average),
		p50: +percentile(times, 50).toFixed(2),
		p95: +percentile(times, 95).toFixed(2),
		p99: +percentile(times, 99).toFixed(2),
		non2xx: res.non2xx,
		errors: res.errors,
		note
	};
}

async function firstWorking(paths: string[], cookie: string): Promise<string | null> {
	for (const p of paths) {
		const r = await fetch(`${BASE}${p}`, { headers: { cookie } });
		if (r.ok) return p;
	}
	return null;
}

/**
 * The station move a scan makes for a unit in each state (moves that need no record first).
 * A unit walks on through these; once it has no such move left it is held and released in
 * turn at its station, so a run never runs out of real moves however fast the server is.
 */
const SCAN_MOVE: Record<string, { action: string; station: string; to: string }> = {
	received: { action: 'inspect', station: 'TEARDOWN-1', to: 'inspected' },
	accepted: { action: 'clean', station: 'WASH', to: 'cleaned' },
	cleaned: { action: 'machine', station: 'LATHE-B', to: 'machined' },
	machined: { action: 'paint', station: 'PAINT', to: 'painted' }
};
const HOLD_STATION: Record<string, string> = { inspected: 'TEARDOWN-1', painted: 'BUILD-1' };

type PoolUnit = { serial: string; state: string; held?: boolean };

/** The next move for a pool unit, and the unit as it will be once the move is made. */
function nextScan(u: PoolUnit): { action: string; station: string; data?: Record<string, unknown> } {
	const move = SCAN_MOVE[u.state];
	if (move && !u.held) {
		u.state = move.to;
		return move;
	}
	const station = HOLD_STATION[u.state] ?? 'BUILD-1';
	u.held = !u.held;
	return u.held ? { action: 'hold', station, data: { reason: 'Waiting for a wheel' } } : { action: 'release', station };
}

/** Scans fed from a pool of units waiting at stations; each scan moves one unit on. */
function scanRequests(pool: PoolUnit[], cookie: string) {
	let next = 0;
	let n = 0;
	// keys are unique across runs: a key seen before with another body is refused as a conflict
	const run = randomUUID().slice(0, 8);
	return {
		method: 'POST' as const,
		headers: { cookie, 'content-type': 'application/json' },
		requests: [
			{
				setupRequest: (req: Record<string, unknown>) => {
					const move = nextScan(pool[next++ % pool.length]);
					n += 1;
					return {
						...req,
						method: 'POST',
						path: `/api/units/${pool[(next - 1) % pool.length].serial}/events`,
						body: JSON.stringify({
							action: move.action,
							stationCode: move.station,
							idempotencyKey: `bench-${run}-${n}`,
							...(move.data ? { data: move.data } : {})
						})
					};
				}
			}
		]
	};
}

async function liveLatency(cookie: string, pool: PoolUnit[], count = 200): Promise<{ p50: number; p95: number; max: number; missed: number }> {
	const controller = new AbortController();
	const res = await fetch(`${BASE}/api/stream`, { headers: { cookie }, signal: controller.signal });
	const reader = res.body!.getReader();
	const arrived = new Map<string, number>();
	const decoder = new TextDecoder();
	let buffer = '';
	const pump = (async () => {
		for (;;) {
			const { value, done } = await reader.read().catch(() => ({ value: undefined, done: true }));
			if (done) return;
			buffer += decoder.decode(value, { stream: true });
			let i;
			while ((i = buffer.indexOf('\n\n')) >= 0) {
				const chunk = buffer.slice(0, i);
				buffer = buffer.slice(i + 2);
				const data = chunk.split('\n').find((l) => l.startsWith('data: '));
				if (data) {
					try {
						const m = JSON.parse(data.slice(6));
						if (m.serial && !arrived.has(m.serial)) arrived.set(m.serial, performance.now());
					} catch {
						/* skip */
					}
				}
			}
		}
	})();
	await new Promise((r) => setTimeout(r, 300));
	const acked = new Map<string, number>();
	for (let i = 0; i < count; i++) {
		const serial = pool[i].serial;
		const move = nextScan(pool[i]);
		const r = await fetch(`${BASE}/api/units/${serial}/events`, {
			method: 'POST',
			headers: { cookie, 'content-type': 'application/json' },
			body: JSON.stringify({
				action: move.action,
				stationCode: move.station,
				idempotencyKey: `live-${process.pid}-${i}`,
				...(move.data ? { data: move.data } : {})
			})
		});
		await r.arrayBuffer();
		if (r.status === 201) acked.set(serial, performance.now());
		await new Promise((r) => setTimeout(r, 5));
	}
	await new Promise((r) => setTimeout(r, 1000));
	controller.abort();
	await pump.catch(() => {});
	const lat = [...acked].map(([s, t]) => (arrived.has(s) ? Math.max(0, arrived.get(s)! - t) : Infinity));
	const ok = lat.filter(Number.isFinite).sort((a, b) => a - b);
	return { p50: +percentile(ok, 50).toFixed(2), p95: +percentile(ok, 95).toFixed(2), max: +(ok.at(-1) ?? NaN).toFixed(2), missed: lat.length - ok.length };
}

function clientWeight(html: string, pagePath: string): { kb: number; files: number } {
	const found = [...html.matchAll(/["']((?:\.{1,2}\/|\/)*_app\/immutable\/[^"']+\.js)["']/g)].map((m) => new URL(m[1], `http://x${pagePath}`).pathname);
	const seen = new Set(found);
	const queue = [...seen];
	let bytes = 0;
	for (const h of seen) bytes += gzipSync(readFileSync(`build/client${h}`)).length;
	// follow the static imports of every module the page loads
	while (queue.length) {
		const h = queue.pop()!;
		const src = readFileSync(`build/client${h}`, 'utf8');
		for (const m of src.matchAll(/(?:import|from)\s*["'](\.{1,2}\/[^"']+\.js)["']/g)) {
			const abs = new URL(m[1], `http://x${h}`).pathname;
			if (!seen.has(abs)) {
				seen.add(abs);
				queue.push(abs);
				bytes += gzipSync(readFileSync(`build/client${abs}`)).length;
			}
		}
	}
	return { kb: +(bytes / 1024).toFixed(1), files: seen.size };
}

async function main() {
	const reuse = process.argv.includes('--reuse') && existsSync(FILE);
	let seeding: { ms: number; units: number; events: number; lots: number } | null = null;
	if (!reuse) {
		console.log(`Seeding ${FILE} …`);
		seeding = await seedLarge(FILE);
		console.log(`  ${seeding.lots} lots, ${seeding.units} units, ${seeding.events} events in ${(seeding.ms / 1000).toFixed(1)} s`);
	}
	const buildStale = !existsSync('build/index.js') || statSync('build/index.js').mtimeMs < Date.now() - 10 * 60_000;
	if (buildStale || process.argv.includes('--build')) {
		console.log('Building …');
		const b = spawnSync('npx', ['vite', 'build', '--logLevel', 'error'], { stdio: 'inherit' });
		if (b.status !== 0) process.exit(1);
	}
	const ro = new Database(FILE, { readonly: true });
	const pool = ro
		.prepare(`select serial, state from unit where state in ('received', 'accepted', 'cleaned', 'machined', 'painted') and held = 0 order by random()`)
		.all() as { serial: string; state: string }[];
	const sample = (ro.prepare(`select serial from unit order by random() limit 2000`).all() as { serial: string }[]).map((r) => r.serial);
	ro.close();
	console.log(`  ${pool.length} units waiting at stations feed the scan runs`);

	const server: ChildProcess = spawn('node', ['server.js'], {
		env: { ...process.env, PORT: String(PORT), HOST: '127.0.0.1', ORIGIN, DATABASE_URL: FILE },
		stdio: ['ignore', 'ignore', 'inherit']
	});
	const rows: Row[] = [];
	let live: Awaited<ReturnType<typeof liveLatency>> | null = null;
	let weight: ReturnType<typeof clientWeight> | null = null;
	try {
		await waitUp();
		const tech = await signIn(TECH);
		const owner = await signIn(OWNER);
		const livePool = pool.splice(0, 220);
		const scanPool32 = pool.splice(0, Math.floor(pool.length * 0.7));
		let s = 0;
		const history = {
			headers: { cookie: tech },
			requests: [{ setupRequest: (req: Record<string, unknown>) => ({ ...req, path: `/api/units/${sample[s++ % sample.length]}` }) }]
		};
		const board = await firstWorking(['/api/stations/TEARDOWN-1/board', '/stations/TEARDOWN-1/__data.json'], tech);
		const scrap = await firstWorking(['/api/reports/scrap'], owner);
		for (const c of [1, 32]) {
			rows.push(await run('trivial JSON (/api/health)', c, { path: '/api/health' }));
			rows.push(await run('scan (POST move)', c, scanRequests(c === 1 ? pool : scanPool32, tech)));
			if (board) {
				rows.push(await run(`station board (${board})`, c, { path: board, headers: { cookie: tech } }));
				// a board polling while nothing changed: its ETag back, answered 304 without building the board
				const etag = (await fetch(`${BASE}${board}`, { headers: { cookie: tech } })).headers.get('etag');
				if (etag) rows.push(await run('station board, unchanged (If-None-Match → 304)', c, { path: board, headers: { cookie: tech, 'if-none-match': etag } }, '304 answers counted as non-2xx'));
			}
			rows.push(await run('unit history (/api/units/[serial])', c, history));
			if (scrap) rows.push(await run(`scrap report (${scrap})`, c, { path: scrap, headers: { cookie: owner } }));
		}
		live = await liveLatency(tech, livePool);
		const html = await (await fetch(`${BASE}/stations/TEARDOWN-1`, { headers: { cookie: tech } })).text();
		weight = clientWeight(html, '/stations/TEARDOWN-1');
	} finally {
		server.kill('SIGTERM');
	}

	const trivial32 = rows.find((r) => r.name.startsWith('trivial') && r.connections === 32)!;
	console.log(`\nSpoolyard benchmark — ${cpus().length} × ${cpus()[0]?.model ?? 'cpu'}, Node ${process.version}, ${SECONDS} s per run\n`);
	console.log('| endpoint | conns | req/s | p50 ms | p95 ms | p99 ms | non-2xx | vs trivial |');
	console.log('|---|---:|---:|---:|---:|---:|---:|---:|');
	for (const r of rows) {
		const ratio = r.connections === 32 ? `${Math.round((r.rps / trivial32.rps) * 100)} %` : '';
		console.log(`| ${r.name} | ${r.connections} | ${r.rps} | ${r.p50} | ${r.p95} | ${r.p99} | ${r.non2xx} | ${ratio} |`);
	}
	if (live) console.log(`\nLive latency, scan acknowledged → event on another stream (200 scans): p50 ${live.p50} ms, p95 ${live.p95} ms, max ${live.max} ms, missed ${live.missed}`);
	if (weight) console.log(`Station page JavaScript: ${weight.kb} kB gzipped in ${weight.files} files`);
	if (seeding) console.log(`Seeding: ${seeding.units} units, ${seeding.events} events, ${seeding.lots} lots in ${(seeding.ms / 1000).toFixed(1)} s`);
	writeFileSync(
		'bench/results.json',
		JSON.stringify({ at: new Date().toISOString(), machine: { cpus: cpus().length, model: cpus()[0]?.model, node: process.version }, seconds: SECONDS, seeding, rows, live, clientWeight: weight }, null, 2)
	);
	console.log('\nWritten to bench/results.json');
}

await main();
