/// <reference types="vite-plugin-pwa/client" />
import { getPushConfig, removePushSubscription, savePushSubscription } from '@/api/push';

let registration: Promise<ServiceWorkerRegistration | undefined> | null = null;

/** Registers the service worker once, from the crew's pages; the office app does not need it. */
export function registerServiceWorker(): Promise<ServiceWorkerRegistration | undefined> {
  if (!('serviceWorker' in navigator) || import.meta.env.DEV) return Promise.resolve(undefined);
  registration ??= import('virtual:pwa-register')
    .then(({ registerSW }) => {
      registerSW({ immediate: true });
      return navigator.serviceWorker.ready;
    })
    .catch(() => undefined);
  return registration;
}

export type PushState = 'unsupported' | 'not-set-up' | 'blocked' | 'off' | 'on';

function base64UrlToBytes(value: string): Uint8Array<ArrayBuffer> {
  const padded = `${value}${'='.repeat((4 - (value.length % 4)) % 4)}`.replace(/-/g, '+').replace(/_/g, '/');
  const raw = atob(padded);
  const bytes = new Uint8Array(new ArrayBuffer(raw.length));
  for (let i = 0; i < raw.length; i += 1) bytes[i] = raw.charCodeAt(i);
  return bytes;
}

export async function pushState(): Promise<PushState> {
  if (!('PushManager' in window) || !('Notification' in window) || !('serviceWorker' in navigator)) return 'unsupported';
  const config = await getPushConfig().catch(() => ({ publicKey: null }));
  if (!config.publicKey) return 'not-set-up';
  if (Notification.permission === 'denied') return 'blocked';
  const worker = await registerServiceWorker();
  const existing = await worker?.pushManager.getSubscription();
  return existing ? 'on' : 'off';
}

export async function turnPushOn(): Promise<PushState> {
  const config = await getPushConfig();
  const worker = await registerServiceWorker();
  if (!config.publicKey || !worker) return 'not-set-up';
  const permission = await Notification.requestPermission();
  if (permission !== 'granted') return permission === 'denied' ? 'blocked' : 'off';
  const subscription = await worker.pushManager.subscribe({ userVisibleOnly: true, applicationServerKey: base64UrlToBytes(config.publicKey) });
  const json = subscription.toJSON();
  await savePushSubscription({ endpoint: subscription.endpoint, keys: { p256dh: json.keys?.p256dh ?? '', auth: json.keys?.auth ?? '' } });
  return 'on';
}

export async function turnPushOff(): Promise<PushState> {
  const worker = await registerServiceWorker();
  const subscription = await worker?.pushManager.getSubscription();
  if (subscription) {
    await removePushSubscription(subscription.endpoint).catch(() => undefined);
    await subscription.unsubscribe();
  }
  return 'off';
}
