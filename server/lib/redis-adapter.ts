import { createAdapter } from '@socket.io/redis-adapter';
import { createClient } from 'redis';
import type { Logger } from './logger';

/**
 * socket.io's Redis adapter: a broadcast (and a room change or disconnect by room, such as
 * signing a session out) reaches the sockets held by every server process. Redis keeps
 * nothing here but the pub/sub traffic, so it needs no persistence. While Redis is away a
 * process keeps serving its own sockets; the client reconnects and reloads what it shows.
 */
export async function connectRedisAdapter(url: string, log: Logger) {
  const pub = createClient({ url });
  const sub = pub.duplicate();
  for (const client of [pub, sub]) client.on('error', (error: unknown) => log.warn({ err: String(error) }, 'redis connection problem'));
  await Promise.all([pub.connect(), sub.connect()]);
  log.info({ redis: new URL(url).host }, 'socket.io uses the Redis adapter');
  return {
    adapter: createAdapter(pub, sub),
    async close() {
      await Promise.allSettled([pub.quit(), sub.quit()]);
    },
  };
}
