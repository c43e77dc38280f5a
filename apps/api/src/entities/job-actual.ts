import { Column, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn, type Relation } from 'typeorm';
import { Job } from './job.js';

/**
 * What only the office knows about a finished job, for the estimate-against-actual report; days, weather and
 * hire come from the board, the stand-downs and the access bookings.
 */
@Entity({ name: 'job_actual' })
@Index(['jobId'], { unique: true })
export class JobActual {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'job_id', type: 'uuid' })
  jobId: string;

  @ManyToOne(() => Job, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'job_id' })
  job: Relation<Job>;

  @Column({ name: 'extra_materials_pence', type: 'int', default: 0 })
  extraMaterialsPence: number;

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
