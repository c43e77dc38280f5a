import { Column, Entity, PrimaryColumn, UpdateDateColumn, VersionColumn } from 'typeorm';

/** A firm's own weather thresholds: only the ones it changed, as a partial RuleSettings. */
@Entity({ name: 'firm_weather_limits' })
export class FirmWeatherLimits {
  @PrimaryColumn({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'jsonb', default: () => "'{}'" })
  overrides: Record<string, unknown>;

  @Column({ name: 'updated_by', type: 'uuid', nullable: true })
  updatedBy: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
