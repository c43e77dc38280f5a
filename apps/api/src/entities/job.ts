import {
  Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, VersionColumn,
  type Relation,
} from 'typeorm';
import type { AccessNeed, JobPriority, JobStatus, WorkType } from '@hodboard/shared';
import { Client } from './client.js';
import { Site } from './site.js';

@Entity({ name: 'job' })
@Index(['firmId', 'reference'], { unique: true })
@Index(['firmId', 'status'])
export class Job {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  reference: string;

  @Column({ name: 'client_id', type: 'uuid' })
  clientId: string;

  @ManyToOne(() => Client, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'client_id' })
  client: Relation<Client>;

  @Column({ name: 'site_id', type: 'uuid' })
  siteId: string;

  @ManyToOne(() => Site, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'site_id' })
  site: Relation<Site>;

  @Column({ type: 'text' })
  title: string;

  @Column({ type: 'text', nullable: true })
  description: string | null;

  @Column({ name: 'work_types', type: 'text', array: true })
  workTypes: WorkType[];

  @Column({ name: 'estimated_working_days', type: 'int' })
  estimatedWorkingDays: number;

  @Column({ name: 'access_needs', type: 'text', array: true, default: () => "'{}'" })
  accessNeeds: AccessNeed[];

  @Column({ name: 'earliest_start', type: 'date', nullable: true })
  earliestStart: string | null;

  @Column({ name: 'target_finish', type: 'date', nullable: true })
  targetFinish: string | null;

  @Column({ type: 'text', default: 'normal' })
  priority: JobPriority;

  @Column({ name: 'site_notes', type: 'text', nullable: true })
  siteNotes: string | null;

  @Column({ type: 'text', default: 'enquiry' })
  status: JobStatus;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
