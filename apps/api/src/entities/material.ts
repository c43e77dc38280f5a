import { Column, Entity, Index, PrimaryGeneratedColumn, UpdateDateColumn, VersionColumn } from 'typeorm';

@Entity({ name: 'material' })
@Index(['firmId', 'nameKey'], { unique: true })
export class Material {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  name: string;

  /** Lower-cased name: one price per material, however it is typed. */
  @Column({ name: 'name_key', type: 'text' })
  nameKey: string;

  @Column({ type: 'text' })
  unit: string;

  @Column({ name: 'unit_price_pence', type: 'int' })
  unitPricePence: number;

  @Column({ name: 'is_vatable', type: 'boolean', default: true })
  isVatable: boolean;

  @Column({ type: 'text', nullable: true })
  supplier: string | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @UpdateDateColumn({ name: 'updated_at', type: 'timestamptz' })
  updatedAt: Date;
}
