/**
 * The production entry point: the built app's request handler (build/handler.js) on a plain
 * Node HTTP server. It exists so that every answer, including the static files the adapter
 * serves before the app's hooks run (/_app/immutable, favicon, fonts), carries the same
 * protective headers. Settings as the adapter's own entry: PORT (3000), HOST (0.0.0.0),
 * SHUTDOWN_TIMEOUT (30 s), KEEP_ALIVE_TIMEOUT and HEADERS_TIMEOUT (seconds, optional), and
 * BUILD_DIR (the built app's folder, default `build`; a release folder or a symlink to one, see
 * the README on deploying a new build).
 *
 * A static file that disappears while the server runs (a build folder rebuilt in place) is a
 * 404, not the end of the process: see `guardFileStreams`.
 */
import fs from 'node:fs';
import http from 'node:http';
import { resolve } from 'node:path';
import process from 'node:process';
import { pathToFileURL } from 'node:url';

const buildDir = resolve(process.env.BUILD_DIR || 'build');
let handler;
try {
	({ handler } = await import(pathToFileURL(resolve(buildDir, 'handler.js')).href));
} catch (e) {
	// a refused setting (the app's `init` checks them) or a missing build: one sentence, exit 1
	console.error(`Spoolyard did not start: ${e instanceof Error ? e.message : String(e)}`);
	if (process.env.NODE_ENV !== 'production' && e instanceof Error && e.stack) console.error(e.stack);
	process.exit(1);
}

/** Sent on every response; the app's hooks set the same on its own answers (plus the CSP). */
export const BASE_HEADERS = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	'x-frame-options': 'DENY'
};

const host = process.env.HOST ?? '0.0.0.0';
const port = Number(process.env.PORT ?? 3000);
const shutdownTimeout = Number(process.env.SHUTDOWN_TIMEOUT ?? 30);

function notFound(res) {
	res.statusCode = 404;
	res.setHeader('content-type', 'text/plain; charset=utf-8');
	res.end('Not found');
}

/**
 * The adapter's static file server (sirv) lists the build's files once at start, then answers
 * a request with `res.writeHead(200, …)` followed by `fs.createReadStream(file).pipe(res)`,
 * with no error handler on the stream. When the file (or its `.br`/`.gz` twin) is gone by
 * then, the stream's `error` event would be unhandled and end the process.
 *
 * So, per response: `writeHead` is held back until the end of the current tick; a file stream
 * piped into the response in that tick keeps it held until the file has opened (its first
 * bytes or its end release it). If the file cannot be opened, the held head is dropped and the
 * request is answered again without `accept-encoding`, which makes sirv pick the plain file
 * when only a precompressed twin vanished; when that is gone too, or the request asked for no
 * encoding, the answer is a plain 404. A stream that fails after its head went out ends the
 * response (the client sees a cut-off body, the server goes on).
 */
function guardFileStreams(req, res, retry) {
	const writeHead = res.writeHead;
	let held = null;
	let waitingForFile = false;
	// inside write/end Node writes an implicit head through `res.writeHead`: let that one through
	let passthrough = false;
	const release = () => {
		if (!held) return;
		const args = held;
		held = null;
		writeHead.apply(res, args);
	};
	res.writeHead = function (...args) {
		if (passthrough || res.headersSent) return writeHead.apply(res, args);
		held = args;
		queueMicrotask(() => {
			if (!waitingForFile) release();
		});
		return res;
	};
	for (const name of ['write', 'end', 'flushHeaders']) {
		const original = res[name];
		res[name] = function (...args) {
			release();
			passthrough = true;
			try {
				return original.apply(res, args);
			} finally {
				passthrough = false;
			}
		};
	}
	res.on('pipe', (source) => {
		if (!(source instanceof fs.ReadStream)) return;
		if (held) waitingForFile = true;
		source.once('open', () => {
			waitingForFile = false;
		});
		source.on('error', (err) => {
			source.unpipe(res);
			if (held) {
				held = null;
				waitingForFile = false;
				if (retry && req.headers['accept-encoding']) {
					delete req.headers['accept-encoding'];
					retry();
				} else {
					notFound(res);
				}
				return;
			}
			if (!res.headersSent) notFound(res);
			else res.destroy(err);
		});
	});
	return res;
}

const server = http.createServer((req, res) => {
	for (const [name, value] of Object.entries(BASE_HEADERS)) res.setHeader(name, value);
	const answer = (retry) => {
		guardFileStreams(req, res, retry);
		handler(req, res, () => notFound(res));
	};
	answer(() => {
		// one more try without an encoding; guardFileStreams has already wrapped this response
		handler(req, res, () => notFound(res));
	});
});

for (const [env, key] of [
	['KEEP_ALIVE_TIMEOUT', 'keepAliveTimeout'],
	['HEADERS_TIMEOUT', 'headersTimeout']
]) {
	const seconds = Number(process.env[env]);
	if (process.env[env] && Number.isFinite(seconds) && seconds >= 0) server[key] = seconds * 1000;
}

server.listen(port, host, () => {
	const a = server.address();
	console.log(`Listening on http://${typeof a === 'object' && a ? `${a.address}:${a.port}` : `${host}:${port}`}`);
});

let stopping = false;
/** Stop taking connections, let requests in flight finish, then let the app close its work. */
function shutdown(reason) {
	if (stopping) return;
	stopping = true;
	server.closeIdleConnections();
	server.close(() => process.emit('sveltekit:shutdown', reason));
	setTimeout(() => server.closeAllConnections(), shutdownTimeout * 1000).unref();
}
process.on('SIGTERM', () => shutdown('SIGTERM'));
process.on('SIGINT', () => shutdown('SIGINT'));
