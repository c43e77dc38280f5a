import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, VersionColumn, type Relation } from 'typeorm';
import type { DepositStatus } from '@hodboard/shared';
import { Quote } from './quote.js';

@Entity({ name: 'deposit' })
@Index(['quoteId'], { unique: true })
export class Deposit {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'quote_id', type: 'uuid' })
  quoteId: string;

  @ManyToOne(() => Quote, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'quote_id' })
  quote: Relation<Quote>;

  @Column({ name: 'amount_pence', type: 'int' })
  amountPence: number;

  @Column({ type: 'text', default: 'pending' })
  status: DepositStatus;

  @Column({ name: 'checkout_session_id', type: 'text', nullable: true })
  checkoutSessionId: string | null;

  @Column({ name: 'payment_reference', type: 'text', nullable: true })
  paymentReference: string | null;

  @Column({ name: 'paid_at', type: 'timestamptz', nullable: true })
  paidAt: Date | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
