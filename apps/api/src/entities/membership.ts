import { Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, PrimaryGeneratedColumn, type Relation } from 'typeorm';
import type { Role } from '@hodboard/shared';
import { Firm } from './firm.js';
import { User } from './user.js';

@Entity({ name: 'membership' })
@Index(['firmId', 'userId'], { unique: true })
export class Membership {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @ManyToOne(() => Firm, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'firm_id' })
  firm: Relation<Firm>;

  @Column({ name: 'user_id', type: 'uuid' })
  userId: string;

  @ManyToOne(() => User, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'user_id' })
  user: Relation<User>;

  @Column({ type: 'text' })
  role: Role;

  @Column({ type: 'text', default: 'active' })
  status: 'active' | 'invited';

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
