import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** The ordered log of schedule changes that sockets replay to a client coming back online. */
@Entity({ name: 'schedule_event' })
@Index(['firmId', 'id'])
export class ScheduleEvent {
  @PrimaryGeneratedColumn('increment', { type: 'bigint' })
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'crew_ids', type: 'uuid', array: true })
  crewIds: string[];

  @Column({ type: 'text' })
  type: string;

  @Column({ type: 'jsonb' })
  payload: Record<string, unknown>;

  @CreateDateColumn({ name: 'at', type: 'timestamptz' })
  at: Date;
}
