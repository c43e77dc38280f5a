import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';

/** New dates asked of a supplier for a confirmed booking; answered through a single-use signed link. */
@Entity({ name: 'access_change_request' })
@Index(['firmId', 'bookingId'])
export class AccessChangeRequest {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'booking_id', type: 'uuid' })
  bookingId: string;

  @Column({ type: 'text', default: 'pending' })
  /** withdrawn: closed because the booking was cancelled, struck or taken back to a request. */
  status: 'pending' | 'accepted' | 'countered' | 'superseded' | 'withdrawn';

  @Column({ name: 'old_erect', type: 'date', nullable: true })
  oldErect: string | null;

  @Column({ name: 'old_strike', type: 'date', nullable: true })
  oldStrike: string | null;

  @Column({ name: 'new_erect', type: 'date' })
  newErect: string;

  @Column({ name: 'new_strike', type: 'date' })
  newStrike: string;

  @Column({ name: 'counter_erect', type: 'date', nullable: true })
  counterErect: string | null;

  @Column({ name: 'counter_strike', type: 'date', nullable: true })
  counterStrike: string | null;

  @Column({ name: 'supplier_note', type: 'text', nullable: true })
  supplierNote: string | null;

  @Index({ unique: true })
  @Column({ name: 'token_hash', type: 'text' })
  tokenHash: string;

  @Column({ name: 'expires_at', type: 'timestamptz' })
  expiresAt: Date;

  @Column({ name: 'answered_at', type: 'timestamptz', nullable: true })
  answeredAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
