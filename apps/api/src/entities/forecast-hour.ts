import { Column, Entity, PrimaryColumn } from 'typeorm';

/** One stored forecast hour for a site, as last fetched. */
@Entity({ name: 'forecast_hour' })
export class ForecastHourRow {
  @PrimaryColumn({ name: 'site_id', type: 'uuid' })
  siteId: string;

  @PrimaryColumn({ type: 'timestamptz' })
  time: Date;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'temp_c', type: 'real' })
  tempC: number;

  @Column({ name: 'wind_mean_ms', type: 'real' })
  windMeanMs: number;

  @Column({ name: 'wind_gust_ms', type: 'real' })
  windGustMs: number;

  @Column({ name: 'precip_mm', type: 'real' })
  precipMm: number;

  @Column({ name: 'precip_probability', type: 'real' })
  precipProbability: number;

  @Column({ name: 'fetched_at', type: 'timestamptz' })
  fetchedAt: Date;
}
