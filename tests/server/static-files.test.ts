/**
 * A built file that vanishes while the server runs (the build folder rebuilt in place under a
 * running server) is a 404, and the server goes on serving. The adapter's static file server
 * lists the files once at start, so it still "finds" a deleted file and opens a stream on it;
 * that stream's error used to be unhandled and ended the process.
 *
 * Runs on a private copy of the build (`copyOfBuild`): the shared build/ is never touched.
 */
import { readdirSync, readFileSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import { brotliDecompressSync } from 'node:zlib';
import { afterAll, beforeAll, expect, test } from 'vitest';
import { Client, cleanup, copyOfBuild, ensureBuilt, freshDemoDb, startServer, type RunningServer } from '../helpers/server';

const PORT = 4282;
let server: RunningServer;
let dirs: string[] = [];
let buildDir: string;
let client: Client;

beforeAll(async () => {
	await ensureBuilt();
	const db = await freshDemoDb();
	const copy = copyOfBuild();
	buildDir = copy.buildDir;
	dirs = [db.dir, copy.dir];
	server = await startServer(db.file, PORT, { BUILD_DIR: buildDir });
	client = new Client(server.origin);
}, 300_000);

afterAll(async () => {
	client?.close();
	await server?.stop();
	for (const d of dirs) cleanup(d);
});

/** Built JavaScript files under /_app/immutable/<folder> that have a .br and a .gz twin, by URL path. */
function assets(folder: string): string[] {
	const dir = join(buildDir, 'client', '_app', 'immutable', folder);
	const names = readdirSync(dir);
	return names.filter((n) => n.endsWith('.js') && names.includes(`${n}.br`) && names.includes(`${n}.gz`)).map((n) => `/_app/immutable/${folder}/${n}`);
}
const onDisk = (path: string) => join(buildDir, 'client', path);

async function stillServing() {
	expect(server.child.exitCode, server.log()).toBeNull();
	const health = await client.get('/api/health');
	expect(health.status, server.log()).toBe(200);
}

test('a served asset, then the same asset deleted with its .br and .gz: 404 for every encoding, and the server keeps serving', async () => {
	const [start] = assets('entry').filter((p) => /\/start\.[^/]+\.js$/.test(p));
	expect(start).toBeDefined();
	const before = await client.get(start, { headers: { 'accept-encoding': 'br' } });
	expect(before.status).toBe(200);
	expect(before.headers['content-encoding']).toBe('br');

	for (const suffix of ['', '.br', '.gz']) rmSync(onDisk(start + suffix));
	for (const encoding of ['br', 'gzip', 'br, gzip, deflate', '']) {
		const headers: Record<string, string> = encoding ? { 'accept-encoding': encoding } : {};
		const r = await client.get(start, { headers });
		expect(r.status, encoding).toBe(404);
		expect(r.headers['content-encoding'], encoding).toBeUndefined();
		expect(r.headers['x-content-type-options']).toBe('nosniff');
		await stillServing();
	}
	// many at once, on fresh connections, and a HEAD
	const many = await Promise.all(Array.from({ length: 12 }, () => new Client(server.origin).get(start, { headers: { 'accept-encoding': 'br' } })));
	expect(many.map((r) => r.status)).toEqual(Array(12).fill(404));
	expect((await client.request('HEAD', start, { headers: { 'accept-encoding': 'br' } })).status).toBe(404);
	await stillServing();
});

test('only the .br twin vanished (between the listing and the open): the plain file is served instead', async () => {
	const [path] = assets('chunks');
	rmSync(onDisk(`${path}.br`));
	const r = await client.get(path, { headers: { 'accept-encoding': 'br' } });
	expect(r.status).toBe(200);
	expect(r.headers['content-encoding']).toBeUndefined();
	expect(r.text).toBe(readFileSync(onDisk(path), 'utf8'));
	expect(Number(r.headers['content-length'])).toBe(Buffer.byteLength(r.text));
	await stillServing();
});

test('only the plain file vanished: the .br twin still answers a browser that takes br; a client that does not gets a 404', async () => {
	const [, path] = assets('chunks');
	rmSync(onDisk(path));
	const br = await client.request('GET', path, { headers: { 'accept-encoding': 'br' } });
	expect(br.status).toBe(200);
	expect(br.headers['content-encoding']).toBe('br');
	const raw = await fetch(`${server.origin}${path}`, { headers: { 'accept-encoding': 'br' } });
	const body = Buffer.from(await raw.arrayBuffer());
	// fetch decodes br itself; compare with the stored .br file decoded by zlib
	expect(body.toString('utf8')).toBe(brotliDecompressSync(readFileSync(onDisk(`${path}.br`))).toString('utf8'));
	const plain = await client.get(path, { headers: { 'accept-encoding': 'identity' } });
	expect(plain.status).toBe(404);
	await stillServing();
});

test('a file the server never listed (added after start) is a plain 404 from the app', async () => {
	const r = await client.get('/_app/immutable/entry/start.notbuilt.js', { headers: { 'accept-encoding': 'br' } });
	expect(r.status).toBe(404);
	await stillServing();
});
