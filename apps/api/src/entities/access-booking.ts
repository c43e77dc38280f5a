import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, VersionColumn, type Relation } from 'typeorm';
import type { AccessCancelReason, AccessState, AccessType } from '@hodboard/shared';
import { Supplier } from './supplier.js';

/** Hire of scaffold or other access for one job, or for neighbouring jobs at one site. */
@Entity({ name: 'access_booking' })
@Index(['firmId', 'state'])
export class AccessBooking {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Index('idx_access_booking_job_ids', { synchronize: false })
  @Column({ name: 'job_ids', type: 'uuid', array: true })
  jobIds: string[];

  @Column({ name: 'access_type', type: 'text' })
  accessType: AccessType;

  @Column({ name: 'supplier_id', type: 'uuid' })
  supplierId: string;

  @ManyToOne(() => Supplier, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'supplier_id' })
  supplier: Relation<Supplier>;

  @Column({ type: 'text', default: 'requested' })
  state: AccessState;

  @Column({ name: 'requested_erect', type: 'date', nullable: true })
  requestedErect: string | null;

  @Column({ name: 'requested_strike', type: 'date', nullable: true })
  requestedStrike: string | null;

  @Column({ name: 'confirmed_erect', type: 'date', nullable: true })
  confirmedErect: string | null;

  @Column({ name: 'confirmed_strike', type: 'date', nullable: true })
  confirmedStrike: string | null;

  @Column({ name: 'erected_on', type: 'date', nullable: true })
  erectedOn: string | null;

  @Column({ name: 'struck_on', type: 'date', nullable: true })
  struckOn: string | null;

  @Column({ name: 'handed_over_on', type: 'date', nullable: true })
  handedOverOn: string | null;

  /** The supplier's person who handed the access over. */
  @Column({ name: 'handed_over_by', type: 'text', nullable: true })
  handedOverBy: string | null;

  /** The supplier's competent person who signed the access off as ready to use. */
  @Column({ name: 'competent_person', type: 'text', nullable: true })
  competentPersonName: string | null;

  /** The scaffold tag or the supplier's register entry for this handover. */
  @Column({ name: 'handover_tag', type: 'text', nullable: true })
  tagReference: string | null;

  @Column({ name: 'handover_notes', type: 'text', nullable: true })
  handoverNotes: string | null;

  /** Set when Hodboard cancelled the booking because its jobs no longer need it; null when the office did. */
  @Column({ name: 'cancelled_reason', type: 'text', nullable: true })
  cancelledReason: AccessCancelReason | null;

  @Column({ name: 'weekly_rate', type: 'int' })
  weeklyRate: number;

  @Column({ name: 'minimum_weeks', type: 'int' })
  minimumWeeks: number;

  @Column({ name: 'priced_weeks', type: 'int', nullable: true })
  pricedWeeks: number | null;

  @Column({ name: 'curing_days', type: 'int', default: 0 })
  curingDays: number;

  @Column({ type: 'text', nullable: true })
  reference: string | null;

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
