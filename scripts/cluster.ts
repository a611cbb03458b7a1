// The CLI half of `npm run cluster` (scripts/cluster.sh prepares database and build first).
import { parseArgs } from 'node:util';
import { ensureClusterPackages, startCluster } from './lib/cluster';

const { values } = parseArgs({ options: { nodes: { type: 'string', default: '2' } } });
const nodes = Number(values.nodes);
if (!Number.isInteger(nodes) || nodes < 1 || nodes > 16) {
  console.error('--nodes takes a whole number from 1 to 16.');
  process.exit(1);
}

ensureClusterPackages();
const port = Number(process.env.PORT ?? 3000);
// The demo's mail catcher (which the admin mail page reads) runs in the first process only;
// the others deliver to it over SMTP like to any mail server.
const cluster = await startCluster({
  nodes,
  env: { ...process.env, MAIL_CATCHER: 'false' },
  firstNodeEnv: { MAIL_CATCHER: 'true' },
  port,
  stdio: 'inherit',
});
console.log(`\nFaultline runs as ${nodes} processes behind HAProxy: ${process.env.PUBLIC_URL ?? cluster.url}`);
for (const n of cluster.nodes) console.log(`  process ${n.name}: ${n.url} (pid ${n.process.pid})`);
console.log(`  Redis: ${cluster.redisUrl}\nCtrl-C stops them all.`);

let stopping = false;
for (const signal of ['SIGINT', 'SIGTERM'] as const) {
  process.on(signal, () => {
    if (stopping) return;
    stopping = true;
    console.log('\n• Stopping HAProxy, the server processes and Redis…');
    cluster.stop().then(
      () => process.exit(0),
      () => process.exit(1),
    );
  });
}
// A process that dies on its own is reported; HAProxy sends its clients to the others.
for (const n of cluster.nodes)
  n.process.on('exit', (code, signal) => !stopping && console.error(`process ${n.name} exited (${code ?? signal})`));
