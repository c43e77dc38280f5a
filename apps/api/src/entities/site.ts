import {
  Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, VersionColumn,
  type Relation,
} from 'typeorm';
import { Client } from './client.js';

@Entity({ name: 'site' })
@Index(['firmId', 'postcode'])
export class Site {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'client_id', type: 'uuid' })
  clientId: string;

  @ManyToOne(() => Client, { onDelete: 'RESTRICT' })
  @JoinColumn({ name: 'client_id' })
  client: Relation<Client>;

  @Column({ name: 'address_line1', type: 'text' })
  addressLine1: string;

  @Column({ name: 'address_line2', type: 'text', nullable: true })
  addressLine2: string | null;

  @Column({ type: 'text' })
  town: string;

  @Column({ type: 'text' })
  postcode: string;

  @Column({ name: 'access_notes', type: 'text', nullable: true })
  accessNotes: string | null;

  @Column({ type: 'text', nullable: true })
  hazards: string | null;

  @Column({ type: 'double precision', nullable: true })
  lat: number | null;

  @Column({ type: 'double precision', nullable: true })
  lon: number | null;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
