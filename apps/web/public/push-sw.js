// Loaded into the generated service worker: shows Hodboard's pushes and opens the crew's days on a tap.
self.addEventListener('push', (event) => {
  let message = { title: 'Hodboard', body: 'Your schedule changed.', url: '/crew', tag: 'hodboard' };
  try {
    message = { ...message, ...event.data.json() };
  } catch {
    // A push without a JSON body still deserves the generic notice.
  }
  event.waitUntil(
    self.registration.showNotification(message.title, {
      body: message.body,
      tag: message.tag,
      icon: '/icons/hodboard-192.png',
      badge: '/icons/hodboard-maskable-192.png',
      data: { url: message.url },
    }),
  );
});

self.addEventListener('notificationclick', (event) => {
  event.notification.close();
  const url = (event.notification.data && event.notification.data.url) || '/crew';
  event.waitUntil(
    self.clients.matchAll({ type: 'window', includeUncontrolled: true }).then((windows) => {
      const open = windows.find((client) => new URL(client.url).pathname === url);
      return open ? open.focus() : self.clients.openWindow(url);
    }),
  );
});
