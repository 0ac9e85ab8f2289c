import { subscribe, type LiveEvent } from '$lib/server/live';
import type { RequestHandler } from './$types';

const HEARTBEAT_MS = 15_000;

/** Server-sent events: every committed change, as `event: <topic>` with JSON data. */
export const GET: RequestHandler = ({ request }) => {
	const encoder = new TextEncoder();
	let unsubscribe = () => {};
	let heartbeat: ReturnType<typeof setInterval> | undefined;
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			const send = (text: string) => {
				try {
					controller.enqueue(encoder.encode(text));
				} catch {
					close();
				}
			};
			const close = () => {
				unsubscribe();
				if (heartbeat) clearInterval(heartbeat);
				try {
					controller.close();
				} catch {
					/* already closed */
				}
			};
			send(`retry: 2000\n: connected\n\n`);
			unsubscribe = subscribe((e: LiveEvent) => send(`event: ${e.topic}\ndata: ${JSON.stringify(e)}\n\n`));
			heartbeat = setInterval(() => send(`: keep-alive\n\n`), HEARTBEAT_MS);
			request.signal.addEventListener('abort', close, { once: true });
		},
		cancel() {
			unsubscribe();
			if (heartbeat) clearInterval(heartbeat);
		}
	});
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-cache, no-transform',
			connection: 'keep-alive',
			'x-accel-buffering': 'no'
		}
	});
};
