/**
 * The built server, started for tests: build once per run (when `build/` is older than the
 * sources), a throwaway database per server, 127.0.0.1 only, and a small HTTP client with
 * its own connection pool and cookie jar per person.
 */
import { execFileSync, spawn, type ChildProcess } from 'node:child_process';
import { copyFileSync, cpSync, existsSync, mkdirSync, mkdtempSync, readdirSync, rmSync, statSync, symlinkSync, writeFileSync } from 'node:fs';
import http from 'node:http';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { setTimeout as sleep } from 'node:timers/promises';

const ROOT = resolve(import.meta.dirname, '../..');
const STAMP = join(ROOT, 'build', '.built-at');
const LOCK = join(ROOT, '.svelte-kit', 'test-build.lock');
const SOURCES = ['src', 'static', 'svelte.config.js', 'vite.config.ts', 'tailwind.config.ts', 'package.json'];

function newest(path: string): number {
	const full = join(ROOT, path);
	if (!existsSync(full)) return 0;
	const st = statSync(full);
	if (!st.isDirectory()) return st.mtimeMs;
	let max = st.mtimeMs;
	for (const name of readdirSync(full)) max = Math.max(max, newest(join(path, name)));
	return max;
}

function buildIsFresh(): boolean {
	if (!existsSync(STAMP) || !existsSync(join(ROOT, 'build', 'index.js'))) return false;
	const built = statSync(STAMP).mtimeMs;
	return SOURCES.every((s) => newest(s) <= built);
}

/** Build the app unless `build/` is newer than every source; one build at a time across test workers. */
export async function ensureBuilt(): Promise<void> {
	if (process.env.SKIP_TEST_BUILD === '1' && existsSync(join(ROOT, 'build', 'index.js'))) return;
	mkdirSync(join(ROOT, '.svelte-kit'), { recursive: true });
	for (;;) {
		if (buildIsFresh()) return;
		try {
			mkdirSync(LOCK);
		} catch {
			// another worker is building; a lock older than 5 minutes is stale
			if (Date.now() - statSync(LOCK).mtimeMs > 300_000) rmSync(LOCK, { recursive: true, force: true });
			await sleep(500);
			continue;
		}
		try {
			if (!buildIsFresh()) {
				execFileSync('npx', ['vite', 'build', '--logLevel', 'error'], { cwd: ROOT, stdio: ['ignore', 'ignore', 'inherit'] });
				writeFileSync(STAMP, new Date().toISOString());
			}
		} finally {
			rmSync(LOCK, { recursive: true, force: true });
		}
	}
}

let template: Promise<string> | undefined;

/** A migrated, seeded demo database, made once per worker and copied for each server. */
export function demoTemplate(): Promise<string> {
	template ??= (async () => {
		const dir = mkdtempSync(join(tmpdir(), 'spoolyard-template-'));
		const file = join(dir, 'demo.db');
		execFileSync('npx', ['tsx', 'scripts/seed.ts', '--fresh'], {
			cwd: ROOT,
			env: { ...process.env, DATABASE_URL: file },
			stdio: ['ignore', 'ignore', 'inherit']
		});
		// fold the WAL into the main file so one file is a complete copy
		const Database = (await import('better-sqlite3')).default;
		const c = new Database(file);
		c.pragma('wal_checkpoint(TRUNCATE)');
		c.close();
		return file;
	})();
	return template;
}

/** A fresh directory holding a copy of the demo database. */
export async function freshDemoDb(): Promise<{ dir: string; file: string }> {
	const dir = mkdtempSync(join(tmpdir(), 'spoolyard-srv-'));
	const file = join(dir, 'shop.db');
	copyFileSync(await demoTemplate(), file);
	return { dir, file };
}

/**
 * A private copy of the built app, for a test that changes or deletes built files while a
 * server runs on it (pass `BUILD_DIR: buildDir` to `startServer`); the shared `build/` stays
 * untouched. The copy's folder links to the project's node_modules, where the built code
 * finds its packages. Remove `dir` with `cleanup` afterwards.
 */
export function copyOfBuild(): { dir: string; buildDir: string } {
	const dir = mkdtempSync(join(tmpdir(), 'spoolyard-build-'));
	const buildDir = join(dir, 'build');
	cpSync(join(ROOT, 'build'), buildDir, { recursive: true });
	symlinkSync(join(ROOT, 'node_modules'), join(dir, 'node_modules'), 'dir');
	return { dir, buildDir };
}

/**
 * Start `node server.js` expecting it to refuse to start: resolves with its exit code and
 * output once it exits, or rejects when it is still running (and answering) after `waitMs`.
 */
export async function serverRefusal(dbFile: string, port: number, env: Record<string, string | undefined>, waitMs = 30_000): Promise<{ code: number | null; stdout: string; stderr: string }> {
	const fullEnv: Record<string, string | undefined> = { ...process.env, NODE_ENV: 'production', PORT: String(port), HOST: '127.0.0.1', ORIGIN: `http://127.0.0.1:${port}`, DATABASE_URL: dbFile, INSECURE_COOKIES: '1', ...env };
	for (const [k, v] of Object.entries(fullEnv)) if (v === undefined) delete fullEnv[k];
	const child = spawn(process.execPath, ['server.js'], { cwd: ROOT, env: fullEnv as NodeJS.ProcessEnv, stdio: ['ignore', 'pipe', 'pipe'] });
	let stdout = '';
	let stderr = '';
	child.stdout!.on('data', (d) => (stdout += d));
	child.stderr!.on('data', (d) => (stderr += d));
	const exited = new Promise<number | null>((r) => child.once('exit', (code) => r(code)));
	const timer = sleep(waitMs).then(() => 'running' as const);
	const first = await Promise.race([exited, timer]);
	if (first === 'running') {
		child.kill('SIGKILL');
		await exited;
		throw new Error(`the server did not refuse to start within ${waitMs} ms:\n${stdout}${stderr}`);
	}
	return { code: first, stdout, stderr };
}

export interface RunningServer {
	port: number;
	origin: string;
	dbFile: string;
	child: ChildProcess;
	/** Output so far, for failure messages. */
	log(): string;
	stop(): Promise<void>;
	/** SIGKILL: no chance to flush or close anything. */
	kill9(): Promise<void>;
}

/** Start `node server.js` (the built app) on a database file and wait until /api/health answers. */
export async function startServer(dbFile: string, port: number, env: Record<string, string> = {}): Promise<RunningServer> {
	const origin = `http://127.0.0.1:${port}`;
	let out = '';
	const child = spawn(process.execPath, ['server.js'], {
		cwd: ROOT,
		env: { ...process.env, NODE_ENV: 'production', PORT: String(port), HOST: '127.0.0.1', ORIGIN: origin, DATABASE_URL: dbFile, INSECURE_COOKIES: '1', ...env },
		stdio: ['ignore', 'pipe', 'pipe']
	});
	child.stdout!.on('data', (d) => (out = (out + d).slice(-20_000)));
	child.stderr!.on('data', (d) => (out = (out + d).slice(-20_000)));
	const exited = new Promise<void>((r) => child.once('exit', () => r()));
	const deadline = Date.now() + 30_000;
	for (;;) {
		if (child.exitCode !== null) throw new Error(`server exited early (${child.exitCode}):\n${out}`);
		try {
			const r = await fetch(`${origin}/api/health`);
			if (r.ok) break;
		} catch {
			/* not up yet */
		}
		if (Date.now() > deadline) {
			child.kill('SIGKILL');
			throw new Error(`server did not start on ${origin}:\n${out}`);
		}
		await sleep(50);
	}
	const stopWith = async (signal: NodeJS.Signals) => {
		if (child.exitCode === null && child.signalCode === null) child.kill(signal);
		await exited;
	};
	return { port, origin, dbFile, child, log: () => out, stop: () => stopWith('SIGTERM'), kill9: () => stopWith('SIGKILL') };
}

export interface Reply {
	status: number;
	headers: http.IncomingHttpHeaders;
	text: string;
	/** The body as sent (for binary answers such as PDFs). */
	bytes: Buffer;
	json<T = any>(): T; // eslint-disable-line @typescript-eslint/no-explicit-any
}

export interface RequestOptions {
	headers?: Record<string, string>;
	body?: string | Buffer;
	/** Read only the status and headers, then drop the connection (for streams). */
	headOnly?: boolean;
}

/**
 * One person's client: its own keep-alive connections and cookie jar, so that two clients
 * really are two browsers to the server. Redirects are not followed.
 */
export class Client {
	readonly agent = new http.Agent({ keepAlive: true, maxSockets: 4 });
	readonly cookies = new Map<string, string>();
	constructor(readonly origin: string) {}

	cookieHeader(): string {
		return [...this.cookies].map(([k, v]) => `${k}=${v}`).join('; ');
	}

	async request(method: string, path: string, options: RequestOptions = {}): Promise<Reply> {
		try {
			return await this.once(method, path, options);
		} catch (e) {
			// A kept-alive socket the server closed between two requests resets on reuse; Node's http docs
			// advise retrying then. Only reads are retried: a post is never sent twice behind a test's back.
			const err = e as NodeJS.ErrnoException & { reusedSocket?: boolean };
			if ((method === 'GET' || method === 'HEAD') && err.reusedSocket && err.code === 'ECONNRESET') return this.once(method, path, options);
			throw e;
		}
	}

	private once(method: string, path: string, options: RequestOptions): Promise<Reply> {
		const url = new URL(path, this.origin);
		const headers: Record<string, string> = { ...options.headers };
		const jar = this.cookieHeader();
		if (jar && !Object.keys(headers).some((h) => h.toLowerCase() === 'cookie')) headers.cookie = jar;
		if (options.body !== undefined) headers['content-length'] = String(Buffer.byteLength(options.body));
		return new Promise((resolvePromise, reject) => {
			const req = http.request(url, { method, headers, agent: this.agent }, (res) => {
				for (const c of ([] as string[]).concat(res.headers['set-cookie'] ?? [])) {
					const [pair, ...attrs] = c.split(';');
					const eq = pair.indexOf('=');
					const name = pair.slice(0, eq).trim();
					const value = pair.slice(eq + 1).trim();
					const expired = attrs.some((a) => /max-age=0\b/i.test(a.trim())) || value === '';
					if (expired) this.cookies.delete(name);
					else this.cookies.set(name, value);
				}
				if (options.headOnly) {
					res.destroy();
					resolvePromise({ status: res.statusCode ?? 0, headers: res.headers, text: '', bytes: Buffer.alloc(0), json: () => ({}) as never });
					return;
				}
				const chunks: Buffer[] = [];
				res.on('data', (c) => chunks.push(c));
				res.on('end', () => {
					const bytes = Buffer.concat(chunks);
					const text = bytes.toString('utf8');
					resolvePromise({
						status: res.statusCode ?? 0,
						headers: res.headers,
						text,
						bytes,
						json: () => JSON.parse(text)
					});
				});
				res.on('error', reject);
			});
			req.on('error', (e) => reject(Object.assign(e, { reusedSocket: req.reusedSocket })));
			if (options.body !== undefined) req.write(options.body);
			req.end();
		});
	}

	get(path: string, options?: RequestOptions) {
		return this.request('GET', path, options);
	}

	postJson(path: string, body: unknown, headers: Record<string, string> = {}) {
		return this.request('POST', path, { headers: { 'content-type': 'application/json', ...headers }, body: JSON.stringify(body) });
	}

	/** A form post as a browser sends it from our own pages (same Origin). */
	postForm(path: string, fields: Record<string, string> | URLSearchParams, headers: Record<string, string> = {}) {
		const body = (fields instanceof URLSearchParams ? fields : new URLSearchParams(fields)).toString();
		return this.request('POST', path, {
			headers: { 'content-type': 'application/x-www-form-urlencoded', accept: 'text/html', origin: this.origin, ...headers },
			body
		});
	}

	/** A form action as the enhanced form posts it: the answer is JSON. */
	action(path: string, fields: Record<string, string> | URLSearchParams, headers: Record<string, string> = {}) {
		return this.postForm(path, fields, { accept: 'application/json', 'x-sveltekit-action': 'true', ...headers });
	}

	/** Sign in through the real form; throws unless the server lets us in. */
	async signIn(email: string, password: string): Promise<void> {
		const r = await this.postForm('/login', { email, password });
		if (r.status !== 303 || !this.cookies.has('sy_session')) {
			throw new Error(`sign-in as ${email} failed: ${r.status} ${r.text.slice(0, 300)}`);
		}
	}

	close() {
		this.agent.destroy();
	}
}

/** The demo people (src/lib/server/seed.ts) by role. */
export const DEMO_PEOPLE = {
	owner: { email: 'ines@corvidhill.example', password: 'owner-demo-2026' },
	lead: { email: 'tomas@corvidhill.example', password: 'lead-demo-2026' },
	tech: { email: 'rui@corvidhill.example', password: 'tech-demo-2026' },
	tech2: { email: 'dana@corvidhill.example', password: 'tech-demo-2026' },
	office: { email: 'priya@corvidhill.example', password: 'office-demo-2026' }
} as const;

export async function signedIn(origin: string, who: keyof typeof DEMO_PEOPLE): Promise<Client> {
	const c = new Client(origin);
	await c.signIn(DEMO_PEOPLE[who].email, DEMO_PEOPLE[who].password);
	return c;
}

/** Remove a test's temporary directory. */
export function cleanup(dir: string) {
	rmSync(dir, { recursive: true, force: true });
}
