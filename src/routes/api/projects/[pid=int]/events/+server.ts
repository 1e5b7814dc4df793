import { api } from '$lib/server/api';
import { requireRole } from '$lib/server/authz';
import { LIVE_EPOCH, liveCounter, openFeed, subscribe } from '$lib/server/live';
import type { RequestHandler } from './$types';

// The project's live feed as server-sent events: a `hello` with the current counter, then one
// `change` per committed write. A comment every 20 s keeps proxies from closing the stream.
// `?once=1` answers the hello and closes: the counter alone, for a script or a check.
// Open feeds are bounded per person and in all (live.ts openFeed): extras answer 429.
export const GET: RequestHandler = api((event) => {
	const { projectId, user } = requireRole(event, event.params.pid, 'viewer');
	const once = event.url.searchParams.get('once') === '1';
	// counted before the stream starts, so a refusal is an ordinary JSON 429
	const release = once ? () => {} : openFeed(user.id);
	const encoder = new TextEncoder();
	let stop = () => {};
	const stream = new ReadableStream<Uint8Array>({
		start(controller) {
			const send = (text: string) => {
				try {
					controller.enqueue(encoder.encode(text));
				} catch {
					stop();
				}
			};
			send(`event: hello\ndata: ${JSON.stringify({ counter: liveCounter(projectId), epoch: LIVE_EPOCH })}\n\n`);
			if (once) return controller.close();
			const off = subscribe(projectId, (e) => send(`event: change\nid: ${e.counter}\ndata: ${JSON.stringify(e)}\n\n`));
			const beat = setInterval(() => send(': keep-alive\n\n'), 20_000);
			stop = () => {
				off();
				clearInterval(beat);
				release();
			};
			event.request.signal.addEventListener('abort', () => {
				stop();
				try {
					controller.close();
				} catch {
					// already closed
				}
			});
		},
		cancel() {
			stop();
		}
	});
	return new Response(stream, {
		headers: {
			'content-type': 'text/event-stream; charset=utf-8',
			'cache-control': 'no-store',
			'x-accel-buffering': 'no'
		}
	});
});
