import { makeTool } from './facility-fixtures';
import { signedInClient } from '../support/factories';
import type { TestServer } from '../support/server';
import type { Sequelize } from 'sequelize';

// Helpers for the alarm tests: a tool with a key (made through the admin API, as an admin
// would), and a tiny client that posts to the ingest API with that key.

export async function toolWithKey(server: TestServer, opts: Parameters<typeof makeTool>[1] = {}) {
  const made = await makeTool(server.deps.sequelize as Sequelize, opts);
  const { client: admin } = await signedInClient(server.url, 'admin');
  const r = await admin.post(`/api/tools/${made.tool.code}/keys`, { label: 'host PC' });
  if (r.status !== 201) throw new Error(`key failed: ${r.status} ${r.text}`);
  return { ...made, key: r.body.key as string, keyId: r.body.id as number, admin };
}

export async function ingest(server: { url: string }, key: string | null, path: 'alarms' | 'counters', body: unknown) {
  const res = await fetch(`${server.url}/api/ingest/v1/${path}`, {
    method: 'POST',
    headers: { 'content-type': 'application/json', ...(key ? { authorization: `Bearer ${key}` } : {}) },
    body: typeof body === 'string' ? body : JSON.stringify(body),
  });
  const text = await res.text();
  let json: any = null;
  try {
    json = text ? JSON.parse(text) : null;
  } catch {
    json = null;
  }
  return { status: res.status, body: json, text };
}

let seq = 0;
/** An alarm event with a fresh sender id. */
export function alarmEvent(alarmId: number | string, set: boolean, at: Date, extra: Record<string, unknown> = {}) {
  seq++;
  return { id: `ev-${process.pid}-${Date.now()}-${seq}`, alarmId, set, text: `Alarm text ${alarmId}`, at: at.toISOString(), ...extra };
}

/** Set and clear pairs: set at start + i·stepMs, cleared holdMs later. */
export function setClearPairs(
  alarmId: number | string,
  count: number,
  start: Date,
  stepMs: number,
  holdMs: number,
  extra: Record<string, unknown> = {},
) {
  const out = [];
  for (let i = 0; i < count; i++) {
    const t = start.getTime() + i * stepMs;
    out.push(alarmEvent(alarmId, true, new Date(t), extra), alarmEvent(alarmId, false, new Date(t + holdMs), extra));
  }
  return out;
}
