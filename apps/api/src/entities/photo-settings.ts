import { Column, Entity, PrimaryColumn, UpdateDateColumn } from 'typeorm';

/** One row per firm once the owner has chosen; no row means the safe default (location removed). */
@Entity({ name: 'photo_settings' })
export class PhotoSettingsRow {
  @PrimaryColumn({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'remove_location', type: 'boolean', default: true })
  removeLocation: boolean;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
