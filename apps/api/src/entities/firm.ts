import { Column, CreateDateColumn, Entity, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn } from 'typeorm';

@Entity({ name: 'firm' })
export class Firm {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ type: 'text' })
  name: string;

  @Column({ type: 'text', nullable: true })
  email: string | null;

  @Column({ type: 'text', nullable: true })
  phone: string | null;

  @Column({ type: 'text', nullable: true })
  address: string | null;

  @Column({ name: 'time_zone', type: 'text', default: 'Europe/London' })
  timeZone: string;

  @Column({ name: 'holiday_region', type: 'text', default: 'GB-ENG' })
  holidayRegion: 'GB-ENG' | 'GB-SCT' | 'GB-NIR';

  @Column({ name: 'working_weekdays', type: 'int', array: true, default: () => "'{1,2,3,4,5}'" })
  workingWeekdays: number[];

  @Column({ name: 'day_start', type: 'text', default: '08:00' })
  dayStart: string;

  @Column({ name: 'day_end', type: 'text', default: '16:30' })
  dayEnd: string;

  @Column({ type: 'date', array: true, default: () => "'{}'" })
  closures: string[];

  @Column({ name: 'job_sequence', type: 'int', default: 0 })
  jobSequence: number;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
