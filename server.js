/**
 * The production entry point: the built app's request handler (build/handler.js) on a plain
 * Node HTTP server. It exists so that every answer, including the static files the adapter
 * serves before the app's hooks run (/_app/immutable, favicon, fonts), carries the same
 * protective headers. Settings as the adapter's own entry: PORT (3000), HOST (0.0.0.0),
 * SHUTDOWN_TIMEOUT (30 s), KEEP_ALIVE_TIMEOUT and HEADERS_TIMEOUT (seconds, optional).
 */
import http from 'node:http';
import process from 'node:process';
import { handler } from './build/handler.js';

/** Sent on every response; the app's hooks set the same on its own answers (plus the CSP). */
export const BASE_HEADERS = {
	'x-content-type-options': 'nosniff',
	'referrer-policy': 'same-origin',
	'x-frame-options': 'DENY'
};

const host = process.env.HOST ?? '0.0.0.0';
const port = Number(process.env.PORT ?? 3000);
const shutdownTimeout = Number(process.env.SHUTDOWN_TIMEOUT ?? 30);

const server = http.createServer((req, res) => {
	for (const [name, value] of Object.entries(BASE_HEADERS)) res.setHeader(name, value);
	handler(req, res, () => {
		res.statusCode = 404;
		res.setHeader('content-type', 'text/plain; charset=utf-8');
		res.end('Not found');
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
