import { useMutation, useQuery, useQueryClient, queryOptions } from '@tanstack/react-query';
import { api } from '@/lib/api-client';
import type { PushStatus } from '@shared/schemas/push';

export const pushKeys = { all: ['push'] as const, status: () => [...pushKeys.all, 'status'] as const };

export const pushStatusQuery = () => queryOptions({ queryKey: pushKeys.status(), queryFn: () => api.get<PushStatus>('/api/push') });

/** Whether this browser can take pushes at all (https or localhost, with a service worker). */
export const pushSupported = () =>
  typeof window !== 'undefined' &&
  window.isSecureContext &&
  'serviceWorker' in navigator &&
  'PushManager' in window &&
  'Notification' in window;

function keyBytes(base64url: string) {
  const raw = atob(base64url.replace(/-/g, '+').replace(/_/g, '/'));
  return Uint8Array.from(raw, (c) => c.charCodeAt(0));
}

async function currentSubscription() {
  const registration = await navigator.serviceWorker.register('/service-worker.js', { scope: '/' });
  await navigator.serviceWorker.ready;
  return { registration, subscription: await registration.pushManager.getSubscription() };
}

/** Asks the person, subscribes this browser with our VAPID key, and tells the server. */
async function enablePush(publicKey: string): Promise<PushStatus> {
  const permission = await Notification.requestPermission();
  if (permission !== 'granted') throw new Error('Notifications are blocked for this site in the browser settings.');
  const { registration, subscription } = await currentSubscription();
  const sub =
    subscription ?? (await registration.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: keyBytes(publicKey) }));
  return api.post<PushStatus>('/api/push/subscriptions', sub.toJSON());
}

async function disablePush(): Promise<PushStatus | null> {
  const { subscription } = await currentSubscription();
  if (!subscription) return null;
  await subscription.unsubscribe();
  return api.post<PushStatus>('/api/push/subscriptions/remove', { endpoint: subscription.endpoint });
}

export function useThisBrowserSubscribed() {
  return useQuery({
    queryKey: [...pushKeys.all, 'this-browser'],
    queryFn: async () => (pushSupported() ? !!(await currentSubscription()).subscription : false),
    staleTime: Infinity,
  });
}

export function usePushStatus() {
  return useQuery(pushStatusQuery());
}

export function useSetPush() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: async ({ on, publicKey }: { on: boolean; publicKey: string }) => (on ? enablePush(publicKey) : disablePush()),
    onSuccess: () => queryClient.invalidateQueries({ queryKey: pushKeys.all }),
  });
}
