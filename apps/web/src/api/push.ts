import type { PushConfigDto, PushSubscriptionInput } from '@hodboard/shared';
import { http } from './http';

export function getPushConfig(): Promise<PushConfigDto> {
  return http.get<PushConfigDto>('/push/config');
}

export function savePushSubscription(input: PushSubscriptionInput): Promise<void> {
  return http.post('/push/subscriptions', input);
}

export function removePushSubscription(endpoint: string): Promise<void> {
  return http.post('/push/subscriptions/remove', { endpoint });
}
