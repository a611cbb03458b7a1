import { EventEmitter } from 'node:events';
import { describe, expect, it } from 'vitest';
import type { Request, Response } from 'express';
import { ingestGate } from '../../server/modules/alarms/ingest-gate';
import { AppError } from '../../server/lib/errors';

function fakeRes() {
  const res = new EventEmitter() as EventEmitter & { headers: Record<string, string>; setHeader: (k: string, v: string) => void };
  res.headers = {};
  res.setHeader = (k, v) => (res.headers[k] = v);
  return res;
}

describe('ingest gate', () => {
  it('when more ingest requests come than may work and wait, then the extra ones get 503 with Retry-After, and waiting ones start as others finish', () => {
    const gate = ingestGate({ concurrent: 1, queue: 1, retryAfterSeconds: 3 });
    const started: number[] = [];
    const errors: unknown[] = [];
    const responses = [fakeRes(), fakeRes(), fakeRes()];
    responses.forEach((res, i) =>
      gate({} as Request, res as unknown as Response, (err?: unknown) => (err ? errors.push(err) : started.push(i))),
    );
    expect(started).toEqual([0]);
    expect(errors).toHaveLength(1);
    expect((errors[0] as AppError).status).toBe(503);
    expect(responses[2].headers['Retry-After']).toBe('3');
    responses[0].emit('finish');
    expect(started).toEqual([0, 1]);
    responses[1].emit('close');
    const late = fakeRes();
    gate({} as Request, late as unknown as Response, () => started.push(3));
    expect(started).toEqual([0, 1, 3]);
  });
});
