import { useEffect, useState } from 'react';
import { io } from 'socket.io-client';
import { useQueryClient } from '@tanstack/react-query';
import { displayKeys } from '@/features/display/api/display-keys';

export type DisplaySocketStatus = 'connecting' | 'live' | 'reconnecting';

// Events that change what the lobby board shows.
const BOARD_EVENTS = ['tool.state_changed', 'facility.updated', 'ticket.created', 'ticket.updated'];

/**
 * The lobby display's own socket, identified by its key rather than a session. Changes
 * refetch the board; a reconnect refetches everything (events during the gap are lost);
 * a cut-off by the server or a refused handshake re-checks the key, which shows the
 * "not valid any more" screen once the link is revoked.
 */
export function useDisplaySocket(key: string, enabled: boolean): DisplaySocketStatus {
  const queryClient = useQueryClient();
  const [status, setStatus] = useState<DisplaySocketStatus>('connecting');

  useEffect(() => {
    if (!enabled) return;
    const socket = io({ path: '/socket.io', auth: { displayKey: key }, forceNew: true, withCredentials: true });
    let timer: ReturnType<typeof setTimeout> | null = null;
    let retry: ReturnType<typeof setTimeout> | null = null;
    const refreshBoard = () => {
      timer ??= setTimeout(() => {
        timer = null;
        void queryClient.invalidateQueries({ queryKey: displayKeys.board(key) });
      }, 150);
    };
    const recheck = () => void queryClient.invalidateQueries({ queryKey: displayKeys.all });

    socket.on('connect', () => setStatus('live'));
    for (const event of BOARD_EVENTS) socket.on(event, refreshBoard);
    socket.io.on('reconnect', recheck);
    socket.on('disconnect', (reason) => {
      setStatus('reconnecting');
      if (reason === 'io server disconnect') recheck();
    });
    socket.on('connect_error', () => {
      setStatus('reconnecting');
      recheck();
      // A refused handshake is not retried by socket.io; try again later (the key may be fine
      // and the server only restarting).
      if (!socket.active && !retry) {
        retry = setTimeout(() => {
          retry = null;
          socket.connect();
        }, 15_000);
      }
    });
    return () => {
      if (timer) clearTimeout(timer);
      if (retry) clearTimeout(retry);
      socket.removeAllListeners();
      socket.io.removeAllListeners();
      socket.disconnect();
    };
  }, [key, enabled, queryClient]);

  return status;
}
