import { EventEmitter } from 'node:events';
import type { Transaction } from 'sequelize';
import type { ServerEventName, ServerEventPayload } from '../../shared/events';

/**
 * Domain events say that something changed. Services publish them; they are emitted only
 * after the transaction commits, so no listener ever sees a change that was rolled back.
 * Names and payloads come from the typed catalogue in shared/events.ts. `audience` says who
 * may learn of it: 'all' signed-in users and displays, 'staff' only, the watchers of one
 * ticket (and staff), or specific users. Only board changes carry content (what the board
 * shows everyone); every other payload carries ids, and clients refetch through the API,
 * which applies the access rules (so internal notes never travel over a socket to a member).
 */
export type Audience = 'all' | 'staff' | { users: number[] } | { ticket: number; staffOnly?: boolean };

export type DomainEvent = {
  [E in ServerEventName]: { type: E; audience: Audience; payload: ServerEventPayload<E> };
}[ServerEventName];

export class DomainEvents {
  private emitter = new EventEmitter();
  private chain: Promise<void> = Promise.resolve();

  constructor() {
    this.emitter.setMaxListeners(50);
  }

  publish(event: DomainEvent, transaction?: Transaction | null) {
    if (transaction) transaction.afterCommit(() => void this.emitter.emit('event', event));
    else this.emitter.emit('event', event);
  }

  /**
   * For events whose payload is read after the commit (a board entry as everyone now sees
   * it). `build` runs after the commit (at once without a transaction); a failure is
   * reported to `onError` and only costs the live update (clients still poll now and then).
   */
  publishAfterCommit(build: () => Promise<DomainEvent[]>, transaction: Transaction | null | undefined, onError: (error: unknown) => void) {
    // One build at a time, in commit order, so a later read is never overtaken by an earlier one.
    const run = () => {
      this.chain = this.chain.then(() =>
        build().then((events) => {
          for (const event of events) this.emitter.emit('event', event);
        }, onError),
      );
    };
    if (transaction) transaction.afterCommit(run);
    else run();
  }

  subscribe(listener: (event: DomainEvent) => void) {
    this.emitter.on('event', listener);
    return () => this.emitter.off('event', listener);
  }
}
