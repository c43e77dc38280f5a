import type { EntityManager } from 'typeorm';
import { AuditEvent } from '../entities/index.js';
import type { Actor } from './actor.js';

export function snapshot(row: object | null): Record<string, unknown> | null {
  if (!row) return null;
  const plain = JSON.parse(JSON.stringify(row)) as Record<string, unknown>;
  delete plain.passwordHash;
  return plain;
}

/** Written inside the caller's transaction, so an audit line exists exactly when the change does. */
export async function recordAudit(
  manager: EntityManager,
  actor: Pick<Actor, 'firmId' | 'userId'>,
  change: { entity: string; entityId: string; action: string; before?: object | null; after?: object | null },
): Promise<void> {
  await recordAudits(manager, actor, [change]);
}

/** Many audit lines in one INSERT, as a re-plan moving hundreds of jobs writes them. */
export async function recordAudits(
  manager: EntityManager,
  actor: Pick<Actor, 'firmId' | 'userId'>,
  changes: Array<{ entity: string; entityId: string; action: string; before?: object | null; after?: object | null }>,
): Promise<void> {
  if (changes.length === 0) return;
  await manager.save(changes.map((change) => manager.create(AuditEvent, {
    firmId: actor.firmId,
    actorUserId: actor.userId,
    entity: change.entity,
    entityId: change.entityId,
    action: change.action,
    before: snapshot(change.before ?? null),
    after: snapshot(change.after ?? null),
  })));
}
