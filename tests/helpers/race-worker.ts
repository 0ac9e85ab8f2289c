/**
 * One racer: a worker thread with its own better-sqlite3 connection to the shared database file.
 * For each job it is sent, it waits at the barrier until every racer holds its job, then makes
 * the move (or undo) through the real service and posts the answer, or what was thrown.
 */
import { parentPort, workerData } from 'node:worker_threads';
import { openDatabase } from '../../src/lib/server/db/index';
import { applyMove } from '../../src/lib/server/units';
import { undoLastMove } from '../../src/lib/server/undo';
import type { ActionName } from '../../src/lib/domain/units/actions';
import { arriveAt, type RaceJob, type RaceOutcome } from './race-rounds';

const { file, barrier, parties } = workerData as { file: string; barrier: SharedArrayBuffer; parties: number };
const db = openDatabase(file, { migrate: false });
const sync = new Int32Array(barrier);
const port = parentPort!;

function run(job: RaceJob): RaceOutcome {
	const started = performance.now();
	const ms = () => performance.now() - started;
	try {
		const r =
			job.kind === 'undo'
				? undoLastMove(db, job.actor, { serial: job.serial, seq: job.undoSeq, idempotencyKey: job.key })
				: applyMove(db, job.actor, {
						serial: job.serial,
						action: job.action as ActionName,
						stationCode: job.stationCode,
						idempotencyKey: job.key,
						expectedVersion: job.expectedVersion,
						data: job.data
					});
		return r.ok
			? { key: job.key, ok: true, status: r.status, version: r.unit.version, state: r.unit.state, ms: ms() }
			: { key: job.key, ok: false, status: r.status, code: r.code, message: r.message, ms: ms() };
	} catch (e) {
		return { key: job.key, threw: e instanceof Error ? `${e.name}: ${e.message}` : String(e), ms: ms() };
	}
}

port.on('message', (msg: { job: RaceJob } | { stop: true }) => {
	if ('stop' in msg) {
		db.$client.close();
		port.close();
		return;
	}
	arriveAt(sync, parties);
	port.postMessage(run(msg.job));
});
port.postMessage({ ready: true });
