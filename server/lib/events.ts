import { EventEmitter } from 'node:events';
import type { Transaction } from 'sequelize';

/**
 * Domain events announce that something changed. Services publish them; they are emitted only
 * after the transaction commits, so no listener ever sees a change that was rolled back.
 * `audience` says who may learn of it: 'all' signed-in users and displays, 'staff' only, or
 * specific users. Payloads carry ids, never content: clients refetch through the API, which
 * applies the access rules (so internal notes never travel over a socket to a member).
 */
export interface DomainEvent {
  type: string;
  audience: 'all' | 'staff' | { users: number[] };
  payload: Record<string, unknown>;
}

export class DomainEvents {
  private emitter = new EventEmitter();

  constructor() {
    this.emitter.setMaxListeners(50);
  }

  publish(event: DomainEvent, transaction?: Transaction | null) {
    if (transaction) transaction.afterCommit(() => void this.emitter.emit('event', event));
    else this.emitter.emit('event', event);
  }

  subscribe(listener: (event: DomainEvent) => void) {
    this.emitter.on('event', listener);
    return () => this.emitter.off('event', listener);
  }
}
