import { Column, Entity, JoinColumn, ManyToOne, PrimaryColumn, type Relation } from 'typeorm';
import { Crew } from './crew.js';
import { Membership } from './membership.js';

@Entity({ name: 'crew_member' })
export class CrewMember {
  @PrimaryColumn({ name: 'crew_id', type: 'uuid' })
  crewId: string;

  @PrimaryColumn({ name: 'member_id', type: 'uuid' })
  memberId: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @ManyToOne(() => Crew, (crew) => crew.members, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'crew_id' })
  crew: Relation<Crew>;

  @ManyToOne(() => Membership, { onDelete: 'CASCADE' })
  @JoinColumn({ name: 'member_id' })
  member: Relation<Membership>;
}
