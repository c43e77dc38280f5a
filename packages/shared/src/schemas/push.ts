import { z } from 'zod';

/** The part of a browser PushSubscription the server needs (RFC 8030 endpoint, RFC 8291 keys). */
export const pushSubscriptionInputSchema = z.object({
  endpoint: z.url({ message: 'Not a push address' }).max(2000),
  keys: z.object({
    p256dh: z.string().min(20).max(200),
    auth: z.string().min(8).max(100),
  }),
});
export type PushSubscriptionInput = z.input<typeof pushSubscriptionInputSchema>;

export const pushUnsubscribeSchema = z.object({ endpoint: z.url().max(2000) });

export interface PushConfigDto {
  /** VAPID public key (RFC 8292) for PushManager.subscribe; null when push is not set up on this server. */
  publicKey: string | null;
}

/** What the service worker shows; small, because push services cap payloads at about 4 KB. */
export interface PushMessageDto {
  title: string;
  body: string;
  url: string;
  tag: string;
}
