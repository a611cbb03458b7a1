/// <reference lib="webworker" />
// Faultline's service worker: it only shows the pushes the server sends ("tool is back",
// "your report was fixed") and opens the page they point to when tapped. No offline caching.
import type { PushPayload } from '@shared/schemas/push';

declare const self: ServiceWorkerGlobalScope;

self.addEventListener('push', (event) => {
  let message: PushPayload;
  try {
    message = event.data?.json() as PushPayload;
  } catch {
    return;
  }
  if (!message?.title) return;
  event.waitUntil(
    self.registration.showNotification(message.title, { body: message.body, data: { link: message.link }, tag: message.link }),
  );
});

self.addEventListener('notificationclick', (event) => {
  event.notification.close();
  const link =
    typeof event.notification.data?.link === 'string' && event.notification.data.link.startsWith('/') ? event.notification.data.link : '/';
  event.waitUntil(
    self.clients.matchAll({ type: 'window', includeUncontrolled: true }).then((windows) => {
      const open = windows.find((w) => new URL(w.url).origin === self.location.origin);
      if (open) return open.focus().then(() => open.navigate(link));
      return self.clients.openWindow(link);
    }),
  );
});
