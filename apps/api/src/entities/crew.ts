import {
  Column, CreateDateColumn, Entity, Index, JoinColumn, ManyToOne, OneToMany, PrimaryGeneratedColumn,
  VersionColumn, type Relation,
} from 'typeorm';
import { Membership } from './membership.js';
import { CrewMember } from './crew-member.js';

@Entity({ name: 'crew' })
@Index(['firmId', 'name'], { unique: true })
export class Crew {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ type: 'text' })
  name: string;

  @Column({ type: 'text' })
  colour: string;

  @Column({ name: 'lead_member_id', type: 'uuid', nullable: true })
  leadMemberId: string | null;

  @ManyToOne(() => Membership, { onDelete: 'SET NULL', nullable: true })
  @JoinColumn({ name: 'lead_member_id' })
  lead: Relation<Membership> | null;

  @OneToMany(() => CrewMember, (member) => member.crew)
  members: Relation<CrewMember[]>;

  @VersionColumn({ type: 'int' })
  version: number;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
