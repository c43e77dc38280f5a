import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { CostingSettings, PriceBreakdown, QuoteContent } from '@hodboard/shared';
import { Quote } from './quote.js';

@Entity({ name: 'quote_version' })
@Index(['quoteId', 'number'], { unique: true })
export class QuoteVersion {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'quote_id', type: 'uuid' })
  quoteId: string;

  @ManyToOne(() => Quote, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'quote_id' })
  quote: Relation<Quote>;

  @Column({ type: 'int' })
  number: number;

  @Column({ type: 'jsonb' })
  content: QuoteContent;

  /** The firm's costing settings the price was worked out with, so a frozen version never moves. */
  @Column({ type: 'jsonb' })
  settings: CostingSettings;

  @Column({ type: 'jsonb' })
  breakdown: PriceBreakdown;

  @Column({ name: 'net_pence', type: 'int' })
  netPence: number;

  @Column({ name: 'gross_pence', type: 'int' })
  grossPence: number;

  @Column({ name: 'deposit_pence', type: 'int' })
  depositPence: number;

  @Column({ name: 'travel_per_day_pence', type: 'int' })
  travelPerDayPence: number;

  @Column({ name: 'frozen_at', type: 'timestamptz', nullable: true })
  frozenAt: Date | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
