import {
  Column, Entity, Index, JoinColumn, ManyToOne, OneToOne, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn,
  type Relation,
} from 'typeorm';
import { Crew } from './crew.js';
import { Job } from './job.js';

/** A job placed on a crew: its first day and how many working days it takes. */
@Entity({ name: 'assignment' })
@Index(['firmId', 'crewId', 'startDate'])
@Index(['firmId', 'endDate'])
export class Assignment {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Index({ unique: true })
  @Column({ name: 'job_id', type: 'uuid' })
  jobId: string;

  @OneToOne(() => Job, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'job_id' })
  job: Relation<Job>;

  @Column({ name: 'crew_id', type: 'uuid' })
  crewId: string;

  @ManyToOne(() => Crew, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'crew_id' })
  crew: Relation<Crew>;

  @Column({ name: 'start_date', type: 'date' })
  startDate: string;

  @Column({ name: 'working_days', type: 'int' })
  workingDays: number;

  /** The span's dates, stored so range queries and double-booking checks need no calendar maths in SQL. */
  @Column({ type: 'date', array: true })
  days: string[];

  @Column({ name: 'end_date', type: 'date' })
  endDate: string;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedBy: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
