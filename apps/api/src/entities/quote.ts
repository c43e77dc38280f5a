import {
  Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn,
  type Relation,
} from 'typeorm';
import type { QuoteStatus } from '@hodboard/shared';
import { Job } from './job.js';

@Entity({ name: 'quote' })
@Index(['jobId'], { unique: true })
@Index(['firmId', 'status'])
export class Quote {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'job_id', type: 'uuid' })
  jobId: string;

  @ManyToOne(() => Job, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'job_id' })
  job: Relation<Job>;

  @Column({ type: 'text' })
  reference: string;

  @Column({ type: 'text', default: 'draft' })
  status: QuoteStatus;

  @Column({ name: 'current_version_id', type: 'uuid', nullable: true })
  currentVersionId: string | null;

  @Column({ name: 'sent_to', type: 'text', nullable: true })
  sentTo: string | null;

  @Column({ name: 'valid_until', type: 'date', nullable: true })
  validUntil: string | null;

  /** SHA-256 of the client's link token; the token itself is only ever in the e-mail. */
  @Column({ name: 'token_hash', type: 'text', nullable: true })
  @Index({ unique: true, where: 'token_hash IS NOT NULL' })
  tokenHash: string | null;

  @Column({ name: 'token_used_at', type: 'timestamptz', nullable: true })
  tokenUsedAt: Date | null;

  @Column({ name: 'accepted_name', type: 'text', nullable: true })
  acceptedName: string | null;

  @Column({ name: 'accepted_at', type: 'timestamptz', nullable: true })
  acceptedAt: Date | null;

  @Column({ name: 'accepted_ip', type: 'text', nullable: true })
  acceptedIp: string | null;

  @Column({ name: 'declined_at', type: 'timestamptz', nullable: true })
  declinedAt: Date | null;

  @Column({ name: 'decline_reason', type: 'text', nullable: true })
  declineReason: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
