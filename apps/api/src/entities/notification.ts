import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** One row per message sent for a change, keyed so the same change is never announced twice. */
@Entity({ name: 'notification' })
@Index(['firmId', 'dedupeKey'], { unique: true })
export class Notification {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'dedupe_key', type: 'text' })
  dedupeKey: string;

  @Column({ type: 'text' })
  channel: 'email' | 'push';

  @Column({ type: 'text' })
  recipient: string;

  @CreateDateColumn({ name: 'sent_at', type: 'timestamptz' })
  sentAt: Date;
}
