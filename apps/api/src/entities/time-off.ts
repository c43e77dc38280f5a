import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, VersionColumn } from 'typeorm';

/** Firm closures, whole-crew leave and one person's leave, each as an RFC 5545 rule. */
@Entity({ name: 'time_off' })
@Index(['firmId', 'scope'])
export class TimeOff {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  scope: 'firm' | 'crew' | 'member';

  @Column({ name: 'crew_id', type: 'uuid', nullable: true })
  crewId: string | null;

  @Column({ name: 'member_id', type: 'uuid', nullable: true })
  memberId: string | null;

  @Column({ type: 'text' })
  label: string;

  @Column({ name: 'start_date', type: 'date' })
  startDate: string;

  @Column({ name: 'end_date', type: 'date' })
  endDate: string;

  @Column({ type: 'text', default: 'none' })
  repeats: 'none' | 'weekly' | 'fortnightly' | 'monthly';

  @Column({ name: 'repeat_until', type: 'date', nullable: true })
  repeatUntil: string | null;

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  @Column({ type: 'text' })
  rule: string;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
