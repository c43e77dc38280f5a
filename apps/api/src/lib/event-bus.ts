import { EventEmitter } from 'node:events';

export interface DomainEvent {
  firmId: string;
  type: string;
  id: string;
  version?: number;
  payload?: unknown;
  /** Crews whose schedules the event touches; their crew rooms hear it too. */
  crewIds?: string[];
}

/** Services publish here only after their transaction has committed. */
export class EventBus {
  private readonly emitter = new EventEmitter();

  publish(event: DomainEvent): void {
    this.emitter.emit('event', event);
  }

  subscribe(listener: (event: DomainEvent) => void): () => void {
    this.emitter.on('event', listener);
    return () => this.emitter.off('event', listener);
  }
}
