import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { spawn, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { startTestServer, freePort, type TestServer } from '../support/server';
import { projectRoot } from '../support/env';
import { toolWithKey } from './alarms-fixtures';

// The forwarder as a real child process, against a real server that is stopped and started
// again on the same port, and itself killed (SIGKILL) and restarted.

let server: TestServer;
let port: number;
let dir: string;
beforeAll(async () => {
  port = await freePort();
  server = await startTestServer({ PORT: String(port) }, { outboxWorker: false });
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'faultline-forwarder-'));
});
afterAll(async () => {
  await server.close();
  fs.rmSync(dir, { recursive: true, force: true });
});

const PATTERN = '^(?<at>\\S+) ALARM (?<id>\\S+) (?<state>SET|CLEAR) (?<text>.*)$';

function startForwarder(key: string, log: string): ChildProcess & { output: string[] } {
  const child = spawn(
    process.execPath,
    [
      '--import',
      'tsx',
      'scripts/forwarder.ts',
      '--url',
      `http://127.0.0.1:${port}`,
      '--key',
      key,
      '--log',
      log,
      '--pattern',
      PATTERN,
      '--poll-ms',
      '100',
      '--max-backoff-ms',
      '300',
      '--batch',
      '40',
    ],
    { cwd: projectRoot, stdio: ['ignore', 'pipe', 'pipe'] },
  ) as ChildProcess & { output: string[] };
  child.output = [];
  child.stdout!.on('data', (d) => child.output.push(String(d)));
  child.stderr!.on('data', (d) => child.output.push(String(d)));
  return child;
}

const stop = (child: ChildProcess, signal: NodeJS.Signals) =>
  new Promise<void>((resolve) => (child.exitCode !== null ? resolve() : (child.once('exit', () => resolve()), child.kill(signal))));

let lineNo = 0;
function appendLines(log: string, n: number) {
  const start = Date.now() - 3600_000;
  const lines = Array.from({ length: n }, () => {
    lineNo++;
    return `${new Date(start + lineNo * 1000).toISOString()} ALARM L${lineNo} SET Line ${lineNo} of the test log`;
  });
  fs.appendFileSync(log, lines.join('\n') + '\n');
}

async function stored(toolId: number) {
  const [row] = await server.deps.sequelize.query<{ n: number; ids: number; texts: number }>(
    `SELECT COUNT(*) AS n, COUNT(DISTINCT sender_id) AS ids, COUNT(DISTINCT text) AS texts FROM alarm_events WHERE tool_id = :toolId`,
    { replacements: { toolId }, type: QueryTypes.SELECT },
  );
  return { n: Number(row.n), ids: Number(row.ids), texts: Number(row.texts) };
}

async function waitFor(check: () => Promise<boolean>, what: string, timeoutMs = 30_000) {
  const until = Date.now() + timeoutMs;
  while (Date.now() < until) {
    if (await check()) return;
    await new Promise((r) => setTimeout(r, 150));
  }
  throw new Error(`timed out waiting for ${what}`);
}

describe('forwarder', () => {
  it('when the server is stopped mid-stream and 100 lines are appended, then after its restart all arrive once; a killed and restarted forwarder sends nothing twice', async () => {
    const { tool, key } = await toolWithKey(server);
    const log = path.join(dir, 'tool.log');
    fs.writeFileSync(log, 'tool log start\n'); // a line that does not match is skipped
    let forwarder = startForwarder(key, log);
    try {
      appendLines(log, 20);
      await waitFor(async () => (await stored(tool.id)).n === 20, '20 events');

      // The server goes away while the forwarder keeps reading.
      await server.close();
      appendLines(log, 100);
      const statePath = `${log}.faultline-state.json`;
      await waitFor(
        async () => JSON.parse(fs.readFileSync(statePath, 'utf8')).pending.length === 100,
        '100 pending events in the state file',
      );
      server = await startTestServer({ PORT: String(port) }, { outboxWorker: false });
      await waitFor(async () => (await stored(tool.id)).n === 120, '120 events after the restart');
      expect(await stored(tool.id)).toEqual({ n: 120, ids: 120, texts: 120 });

      // Kill the forwarder hard in the middle of sending, add lines, start it again.
      appendLines(log, 200);
      await waitFor(async () => (await stored(tool.id)).n > 140, 'some of the next lines');
      await stop(forwarder, 'SIGKILL');
      appendLines(log, 30);
      forwarder = startForwarder(key, log);
      await waitFor(async () => (await stored(tool.id)).n === 350, 'all 350 events');
      await new Promise((r) => setTimeout(r, 600)); // anything resent would arrive by now
      expect(await stored(tool.id)).toEqual({ n: 350, ids: 350, texts: 350 });
      const [occ] = await server.deps.sequelize.query<{ n: number }>(
        `SELECT COUNT(*) AS n FROM alarm_occurrences WHERE tool_id = :toolId`,
        { replacements: { toolId: tool.id }, type: QueryTypes.SELECT },
      );
      expect(Number(occ.n)).toBe(350);
    } finally {
      await stop(forwarder, 'SIGTERM');
    }
  }, 120_000);
});
