import { Column, Entity, Index, PrimaryGeneratedColumn, VersionColumn } from 'typeorm';
import type { AccessType } from '@hodboard/shared';

@Entity({ name: 'supplier' })
@Index(['firmId', 'name'])
export class Supplier {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  name: string;

  @Column({ name: 'contact_name', type: 'text', nullable: true })
  contactName: string | null;

  @Column({ type: 'text', nullable: true })
  email: string | null;

  @Column({ type: 'text', nullable: true })
  phone: string | null;

  @Column({ name: 'lead_time_working_days', type: 'int', default: 3 })
  leadTimeWorkingDays: number;

  @Column({ name: 'minimum_weeks', type: 'int', default: 1 })
  minimumWeeks: number;

  @Column({ name: 'weekly_rates', type: 'jsonb', default: () => "'{}'" })
  weeklyRates: Partial<Record<AccessType, number>>;

  @VersionColumn({ type: 'int' })
  version: number;
}
