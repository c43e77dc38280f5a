import { Column, Entity, PrimaryColumn } from 'typeorm';

/** The last fetch attempt per site: when the forecast last came in, and the last error if it failed. */
@Entity({ name: 'forecast_fetch' })
export class ForecastFetch {
  @PrimaryColumn({ name: 'site_id', type: 'uuid' })
  siteId: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'last_success_at', type: 'timestamptz', nullable: true })
  lastSuccessAt: Date | null;

  @Column({ name: 'last_attempt_at', type: 'timestamptz' })
  lastAttemptAt: Date;

  @Column({ name: 'last_error', type: 'text', nullable: true })
  lastError: string | null;

  /** A digest of the hours last stored, so an unchanged forecast is not re-assessed. */
  @Column({ type: 'text', nullable: true })
  digest: string | null;
}
