import { json } from '@sveltejs/kit';

// Liveness for load balancers and the benchmarks' baseline; touches nothing.
export const GET = () => json({ ok: true });
