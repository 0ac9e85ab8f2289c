/** Small helpers shared by the backup and restore commands. */
import { readdirSync, readlinkSync } from 'node:fs';
import { resolve } from 'node:path';

export function databasePath(): string {
	const url = process.env.DATABASE_URL ?? 'data/spoolyard.db';
	const path = url.startsWith('file:') ? url.slice('file:'.length) : url;
	if (path === ':memory:') throw new Error('DATABASE_URL is :memory:; there is nothing to back up or restore.');
	return resolve(path);
}

/** 2026-12-01T23-02-27Z: sortable, and safe in file names everywhere. */
export function stamp(now = new Date()): string {
	return now.toISOString().replace(/\.\d{3}Z$/, 'Z').replace(/:/g, '-');
}

/**
 * Processes (other than this one) that have the database or its WAL open, from /proc on Linux.
 * Returns null where /proc is not available.
 */
export function processesHolding(dbPath: string): number[] | null {
	let pids: string[];
	try {
		pids = readdirSync('/proc').filter((p) => /^\d+$/.test(p));
	} catch {
		return null;
	}
	const targets = new Set([dbPath, `${dbPath}-wal`, `${dbPath}-shm`]);
	const holders: number[] = [];
	for (const pid of pids) {
		if (Number(pid) === process.pid) continue;
		let fds: string[];
		try {
			fds = readdirSync(`/proc/${pid}/fd`);
		} catch {
			continue; // gone, or not ours to read
		}
		for (const fd of fds) {
			try {
				if (targets.has(readlinkSync(`/proc/${pid}/fd/${fd}`))) {
					holders.push(Number(pid));
					break;
				}
			} catch {
				/* closed meanwhile */
			}
		}
	}
	return holders;
}
