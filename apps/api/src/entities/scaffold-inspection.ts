import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

@Entity({ name: 'scaffold_inspection' })
@Index(['firmId', 'bookingId', 'inspectedAt'])
export class ScaffoldInspection {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'booking_id', type: 'uuid' })
  bookingId: string;

  @Column({ name: 'inspected_at', type: 'timestamptz' })
  inspectedAt: Date;

  /** The inspection's calendar date in the firm's zone, which the due-date rules compare. */
  @Column({ name: 'inspected_on', type: 'date' })
  inspectedOn: string;

  @Column({ name: 'inspector_name', type: 'text' })
  inspectorName: string;

  @Column({ type: 'text' })
  result: 'safe' | 'unsafe';

  @Column({ type: 'text', nullable: true })
  defects: string | null;

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  /** Photos sent through the photo upload to one of the booking's jobs; the bytes stay with the photo rows. */
  @Column({ name: 'photo_ids', type: 'uuid', array: true, default: () => "'{}'" })
  photoIds: string[];

  @Column({ name: 'recorded_by', type: 'uuid', nullable: true })
  recordedBy: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
