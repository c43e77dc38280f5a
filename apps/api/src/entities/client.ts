import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn, VersionColumn } from 'typeorm';
import type { ClientContact } from '@hodboard/shared';

@Entity({ name: 'client' })
@Index(['firmId', 'name'])
export class Client {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  name: string;

  /** In the order the office lists them; the first is the main contact. */
  @Column({ type: 'jsonb', default: () => "'[]'" })
  contacts: ClientContact[];

  @Column({ type: 'text', nullable: true })
  notes: string | null;

  /**
   * The main contact's name, e-mail and phone: what mail is addressed to and the crew phone shows. The main contact is
   * the first (shared `mainContact`); entities load no shared runtime code, so the index is read here directly.
   */
  get contactName(): string | null {
    return this.contacts?.[0]?.name ?? null;
  }

  get email(): string | null {
    return this.contacts?.[0]?.email ?? null;
  }

  get phone(): string | null {
    return this.contacts?.[0]?.phone ?? null;
  }

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
