/**
 * The demo shop in one command: migrate and seed (if empty), build, serve on port 3000.
 */
import { spawnSync, spawn } from 'node:child_process';

const env = {
	...process.env,
	DATABASE_URL: process.env.DATABASE_URL ?? 'data/spoolyard.db',
	PORT: process.env.PORT ?? '3000',
	HOST: process.env.HOST ?? '127.0.0.1',
	ORIGIN: process.env.ORIGIN ?? `http://localhost:${process.env.PORT ?? '3000'}`,
	// teardown photos: up to 12 of 8 MB in one qualification (the server's default limit is 512 kB)
	BODY_SIZE_LIMIT: process.env.BODY_SIZE_LIMIT ?? '100M'
};

function run(cmd: string, args: string[]) {
	const r = spawnSync(cmd, args, { stdio: 'inherit', env });
	if (r.status !== 0) process.exit(r.status ?? 1);
}

run('npx', ['tsx', 'scripts/seed.ts']);
run('npx', ['vite', 'build', '--logLevel', 'warn']);
console.log(`\nSpoolyard demo shop on ${env.ORIGIN} (sign-ins in README.md). Ctrl-C stops it.\n`);
const server = spawn('node', ['server.js'], { stdio: 'inherit', env });
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => server.kill(sig));
server.on('exit', (code) => process.exit(code ?? 0));
