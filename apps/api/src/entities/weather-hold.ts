import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, VersionColumn } from 'typeorm';
import type { ForecastSnapshotHour, HoldReason, JobStatus, ReplanMode } from '@hodboard/shared';

@Entity({ name: 'weather_hold' })
@Index(['firmId', 'jobId'])
@Index(['firmId', 'idempotencyKey'], { unique: true, where: 'idempotency_key IS NOT NULL' })
export class WeatherHold {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'job_id', type: 'uuid' })
  jobId: string;

  @Column({ name: 'crew_id', type: 'uuid', nullable: true })
  crewId: string | null;

  @Column({ type: 'date', array: true })
  dates: string[];

  @Column({ type: 'text' })
  reason: HoldReason;

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  @Column({ name: 'raised_by', type: 'uuid', nullable: true })
  raisedBy: string | null;

  @Column({ name: 'raised_from', type: 'text' })
  raisedFrom: 'office' | 'crew';

  @Column({ type: 'text', default: 'open' })
  status: 'open' | 'replanned' | 'withdrawn';

  @Column({ name: 'forecast_seen', type: 'jsonb', default: () => "'[]'" })
  forecastSeen: ForecastSnapshotHour[];

  /** When the forecast seen was fetched, and whether it was already past its refresh then. */
  @Column({ name: 'forecast_fetched_at', type: 'timestamptz', nullable: true })
  forecastFetchedAt: Date | null;

  @Column({ name: 'forecast_was_stale', type: 'boolean', default: false })
  forecastWasStale: boolean;

  /** The job's status before it was stood down, to go back to once the stand-down is settled. */
  @Column({ name: 'job_status_before', type: 'text', nullable: true })
  jobStatusBefore: JobStatus | null;

  @Column({ name: 'replan_mode', type: 'text', nullable: true })
  replanMode: ReplanMode | null;

  @Column({ name: 'idempotency_key', type: 'text', nullable: true })
  idempotencyKey: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'raised_at', type: 'timestamptz' })
  raisedAt: Date;
}
