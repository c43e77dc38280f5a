import { Column, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn } from 'typeorm';
import type { TravelMode } from '@hodboard/shared';

@Entity({ name: 'costing_settings' })
@Index(['firmId'], { unique: true })
export class CostingSettingsRow {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'running_costs', type: 'jsonb' })
  runningCosts: Array<{ description: string; monthlyPence: number }>;

  @Column({ name: 'working_days_per_month', type: 'double precision' })
  workingDaysPerMonth: number;

  @Column({ name: 'travel_mode', type: 'text' })
  travelMode: TravelMode;

  @Column({ name: 'travel_bands', type: 'jsonb' })
  travelBands: Array<{ upToMiles: number; perDayPence: number }>;

  @Column({ name: 'travel_per_mile_pence', type: 'int' })
  travelPerMilePence: number;

  @Column({ name: 'labour_rates', type: 'jsonb' })
  labourRates: Array<{ label: string; dayRatePence: number }>;

  @Column({ name: 'default_margin_pct', type: 'double precision' })
  defaultMarginPct: number;

  @Column({ name: 'vat_registered', type: 'boolean' })
  vatRegistered: boolean;

  @Column({ name: 'vat_rate_pct', type: 'double precision' })
  vatRatePct: number;

  @Column({ name: 'quote_validity_days', type: 'int' })
  quoteValidityDays: number;

  @Column({ name: 'payment_terms', type: 'text' })
  paymentTerms: string;

  @Column({ name: 'deposit_pct', type: 'double precision' })
  depositPct: number;

  @Column({ name: 'default_waste_pct', type: 'double precision' })
  defaultWastePct: number;

  @Column({ name: 'default_exclusions', type: 'text', nullable: true })
  defaultExclusions: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
