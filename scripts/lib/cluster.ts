// Several Faultline processes on loopback, the way they run on several machines: Redis for
// socket.io's adapter, N server processes on their own ports, HAProxy in front with sticky
// sessions by an inserted cookie and websocket upgrade. Used by `npm run cluster`, by the
// fan-out benchmark and by the multi-process integration test, so all three run one setup.
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '../..');

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = net.createServer();
    s.once('error', reject);
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as net.AddressInfo;
      s.close(() => resolve(port));
    });
  });
}

function which(command: string) {
  return spawnSync('sh', ['-c', `PATH="$PATH:/usr/sbin:/sbin" command -v ${command}`], { encoding: 'utf8' }).stdout.trim() || null;
}

/** redis-server and haproxy from Debian's packages (apt-get; sudo when not root). */
export function ensureClusterPackages() {
  if (which('redis-server') && which('haproxy')) return;
  console.log('• Installing redis-server and haproxy from Debian’s packages (one time)…');
  const sudo = process.getuid?.() === 0 ? [] : ['sudo'];
  const run = (args: string[]) => {
    const r = spawnSync(sudo.length ? 'sudo' : args[0], sudo.length ? args : args.slice(1), {
      stdio: 'inherit',
      env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' },
    });
    if (r.status !== 0) throw new Error(`${args.join(' ')} failed`);
  };
  run(['apt-get', 'update', '-qq']);
  run(['apt-get', 'install', '-y', '-qq', '--no-install-recommends', 'redis-server', 'haproxy']);
}

async function waitFor(check: () => Promise<boolean>, what: string, ms = 90_000) {
  const deadline = Date.now() + ms;
  while (Date.now() < deadline) {
    if (await check().catch(() => false)) return;
    await new Promise((r) => setTimeout(r, 100));
  }
  throw new Error(`${what} did not come up within ${ms / 1000} s`);
}

function stopProcess(child: ChildProcess, signal: NodeJS.Signals = 'SIGTERM'): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return Promise.resolve();
  return new Promise((resolve) => {
    child.once('exit', () => resolve());
    child.kill(signal);
  });
}

export interface ClusterNode {
  name: string;
  port: number;
  url: string;
  process: ChildProcess;
  /** Stops this process (SIGTERM: graceful; SIGKILL: a crash). */
  stop(signal?: NodeJS.Signals): Promise<void>;
}

export interface ClusterOptions {
  nodes?: number;
  /** Environment of every server process (database, secrets, mail, log level…). */
  env: NodeJS.ProcessEnv;
  /** Extra environment for the first process only (e.g. the demo's in-process mail catcher). */
  firstNodeEnv?: NodeJS.ProcessEnv;
  /** Port of the balancer (default: a free one). */
  port?: number;
  /** Where a process's output goes (default: dropped). */
  stdio?: 'inherit' | 'ignore';
}

export interface Cluster {
  url: string;
  redisUrl: string;
  nodes: ClusterNode[];
  stop(): Promise<void>;
}

function spawnServerProcess(name: string, port: number, env: NodeJS.ProcessEnv, stdio: 'inherit' | 'ignore' = 'ignore'): ClusterNode {
  const child = spawn(process.execPath, ['--import', 'tsx', 'server/index.ts'], { cwd: root, env, stdio });
  return { name, port, url: `http://127.0.0.1:${port}`, process: child, stop: (signal) => stopProcess(child, signal) };
}

function waitUntilHealthy(node: ClusterNode) {
  return waitFor(async () => {
    if (node.process.exitCode !== null) throw new Error(`server process ${node.name} exited`);
    return (await fetch(`${node.url}/api/health`)).ok;
  }, `server process ${node.name}`);
}

/** One server process on a free port (no Redis): what `npm start` runs, for benchmarks. */
export async function startServerProcess(env: NodeJS.ProcessEnv, stdio: 'inherit' | 'ignore' = 'ignore'): Promise<ClusterNode> {
  const port = await freePort();
  const node = spawnServerProcess(
    'a',
    port,
    { ...process.env, ...env, PORT: String(port), HOST: '127.0.0.1', PUBLIC_URL: env.PUBLIC_URL ?? `http://127.0.0.1:${port}` },
    stdio,
  );
  try {
    await waitUntilHealthy(node);
  } catch (error) {
    await node.stop();
    throw error;
  }
  return node;
}

/** Starts Redis, the server processes and HAProxy; resolves once the balancer answers. */
export async function startCluster(opts: ClusterOptions): Promise<Cluster> {
  const count = opts.nodes ?? 2;
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-cluster-'));
  const children: ChildProcess[] = [];
  let haproxyPid: number | null = null;
  const stop = async () => {
    if (haproxyPid) {
      try {
        process.kill(haproxyPid, 'SIGTERM');
      } catch {
        // already gone
      }
      haproxyPid = null;
    }
    await Promise.all(children.map((c) => stopProcess(c)));
    fs.rmSync(dir, { recursive: true, force: true });
  };

  try {
    const redisPort = await freePort();
    const redis = spawn(
      which('redis-server') ?? 'redis-server',
      ['--port', String(redisPort), '--bind', '127.0.0.1', '--save', '', '--appendonly', 'no', '--daemonize', 'no'],
      { stdio: 'ignore' },
    );
    children.push(redis);
    const redisUrl = `redis://127.0.0.1:${redisPort}`;
    await waitFor(
      () =>
        new Promise<boolean>((resolve) => {
          const s = net.connect(redisPort, '127.0.0.1', () => {
            s.end();
            resolve(true);
          });
          s.on('error', () => resolve(false));
        }),
      'Redis',
    );

    const balancerPort = opts.port ?? (await freePort());
    const publicUrl = `http://127.0.0.1:${balancerPort}`;
    const nodes: ClusterNode[] = [];
    for (let i = 0; i < count; i++) {
      const name = String.fromCharCode(97 + i);
      const port = await freePort();
      const env = {
        ...process.env,
        ...opts.env,
        ...(i === 0 ? opts.firstNodeEnv : {}),
        PORT: String(port),
        HOST: '127.0.0.1',
        REDIS_URL: redisUrl,
        PUBLIC_URL: opts.env.PUBLIC_URL ?? publicUrl,
        NODE_NAME: name,
      };
      const node = spawnServerProcess(name, port, env, opts.stdio);
      children.push(node.process);
      nodes.push(node);
    }
    await Promise.all(nodes.map((n) => waitUntilHealthy(n)));

    const cfg = path.join(dir, 'haproxy.cfg');
    fs.writeFileSync(
      cfg,
      [
        'global',
        '  maxconn 8192',
        'defaults',
        '  mode http',
        '  timeout connect 2s',
        '  timeout client 60s',
        '  timeout server 60s',
        // A websocket is a tunnel once upgraded: keep it open far longer than a request.
        '  timeout tunnel 1h',
        // A busy process (hundreds of sockets connecting) answers its health check late, not never.
        '  timeout check 5s',
        '  option redispatch',
        '  retries 2',
        'frontend faultline',
        `  bind 127.0.0.1:${balancerPort}`,
        '  default_backend servers',
        'backend servers',
        '  balance roundrobin',
        // Sticky by an inserted cookie (socket.io's polling requests must reach the process that
        // holds their session); on loopback every client has one address, so not by address.
        '  cookie FLNODE insert indirect nocache',
        '  option httpchk GET /api/health',
        ...nodes.map((n) => `  server ${n.name} 127.0.0.1:${n.port} check inter 1s fall 3 rise 1 cookie ${n.name}`),
        '',
      ].join('\n'),
    );
    const pidFile = path.join(dir, 'haproxy.pid');
    const started = spawnSync(which('haproxy') ?? 'haproxy', ['-f', cfg, '-D', '-p', pidFile], { encoding: 'utf8' });
    if (started.status !== 0) throw new Error(`haproxy did not start: ${started.stderr}`);
    haproxyPid = Number(fs.readFileSync(pidFile, 'utf8').trim());
    await waitFor(async () => (await fetch(`${publicUrl}/api/health`)).ok, 'HAProxy');
    return { url: publicUrl, redisUrl, nodes, stop };
  } catch (error) {
    await stop();
    throw error;
  }
}
