import { endpoint } from '@/lib/server/api/endpoint';
import { json } from '@/lib/server/api/respond';

/** Liveness probe: answers once migrations are applied (the middleware waits for them). */
export const GET = endpoint(async () => json({ status: 'ok' }));
