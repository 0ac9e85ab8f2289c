/**
 * A test-only pause inside a move, between reading the unit and writing its new state.
 *
 * Two processes that move the same unit at the same instant overlap inside a move for only a
 * few microseconds, so a race test would almost never see what the database must settle. With
 * `SPOOLYARD_TEST_MOVE_STALL_MS` set (whole milliseconds, 1–1000) every move and undo sleeps that
 * long right after it read the unit, inside its transaction: the transaction still decides the
 * outcome, the window is only wider. Unset (production, the demo, every other test) the stall is
 * `null` and the moves run exactly as without it. The server prints a warning when it is on.
 */
const raw = process.env.SPOOLYARD_TEST_MOVE_STALL_MS;
const ms = raw ? Math.trunc(Number(raw)) : 0;
if (raw && !(ms >= 1 && ms <= 1000)) throw new Error(`SPOOLYARD_TEST_MOVE_STALL_MS must be 1 to 1000 (milliseconds), not "${raw}".`);

/** Sleep the thread (no busy loop) for the configured time; null when no stall is configured. */
export const moveStall: (() => void) | null =
	ms > 0
		? (() => {
				const cell = new Int32Array(new SharedArrayBuffer(4));
				console.warn(`spoolyard: SPOOLYARD_TEST_MOVE_STALL_MS=${ms}: every move pauses ${ms} ms after reading the unit (test setting; never in production)`);
				return () => void Atomics.wait(cell, 0, 0, ms);
			})()
		: null;
