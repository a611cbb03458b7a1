import type { BoardData, BoardTool } from './schemas/facility';

// The one catalogue of socket events, used with socket.io's typed Server/Socket generics on
// the server and the client, so an event's name and payload can only change in one place.
//
// Two kinds of event:
// - Board changes carry what everyone may see: the tool's new board entry (BoardTool, the type
//   the board itself answers with, so a field added to board entries rides along) and the new
//   status counts. They go to the `all` room; clients write them into their caches.
// - Everything else only announces that something changed (ids, never content). Clients that
//   show it refetch through the API, which applies the access rules. Staff-only changes are
//   announced to the `staff` room only; a ticket's changes to `staff` and to `ticket:<id>`,
//   which a socket joins while that ticket's page is open.

/** A tool's board entry changed: its state, a module's state, or its open-ticket count. */
export interface BoardToolChange {
  tool: BoardTool;
  /** Tools per status over the whole board, after the change. */
  counts: BoardData['counts'];
  total: number;
  /**
   * Present when the change was a state change: who set it (the tool page shows the name;
   * null for the system or a user's report).
   */
  stateSetBy?: { id: number; name: string } | null;
}

export interface ServerToClientEvents {
  'board.tool_changed': (change: BoardToolChange) => void;
  /** Areas, tools or modules were added, renamed, moved or retired: refetch the board. */
  'facility.updated': (payload: { toolId: number | null }) => void;
  /** A new report (staff lists); members learn of it through the board's open-ticket count. */
  'ticket.created': (payload: { id: number; toolId: number }) => void;
  /** To `staff`, and to `ticket:<id>` unless the change is staff-only (an internal note). */
  'ticket.updated': (payload: { id: number; toolId: number }) => void;
  'notice.created': (payload: { kind: string; ticketId?: number | null }) => void;
  'notice.read': (payload: { id?: number; all?: boolean }) => void;
  'service_targets.updated': (payload: { priority: string }) => void;
  /** A tool's alarms changed (set, cleared, edited, flagged); its board entry travels separately. */
  'alarm.changed': (payload: { id: number; toolId: number }) => void;
  /** Staff only: plans, work orders, parts or requalification changed. */
  'maintenance.changed': (payload: { toolId?: number; planId?: number; workOrderId?: number | null; ticketId?: number | null }) => void;
  /** A maintenance window was booked, moved or cancelled; the board entry travels separately. */
  'maintenance.window_changed': (payload: { toolId: number }) => void;
}

export type ServerEventName = keyof ServerToClientEvents;
export type ServerEventPayload<E extends ServerEventName> = Parameters<ServerToClientEvents[E]>[0];

/** Acknowledgement of a room request: whether the server let the socket in. */
export type RoomAck = (answer: { ok: boolean }) => void;

export interface ClientToServerEvents {
  /** The ticket's page opened: send me its changes (checked against who may see it). */
  'ticket.watch': (ticketId: number, ack?: RoomAck) => void;
  /** The ticket's page closed. */
  'ticket.unwatch': (ticketId: number) => void;
}

/** The room of one ticket's page. */
export const ticketRoom = (ticketId: number) => `ticket:${ticketId}`;
