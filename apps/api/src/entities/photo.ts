import { Column, CreateDateColumn, Entity, Index, PrimaryGeneratedColumn } from 'typeorm';
import type { PhotoContentType } from '@hodboard/shared';

/** A site photo's record; the bytes (original and thumbnail) live in object storage under the two keys. */
@Entity({ name: 'photo' })
@Index(['firmId', 'jobId', 'createdAt'])
@Index(['firmId', 'idempotencyKey'], { unique: true, where: 'idempotency_key IS NOT NULL' })
export class Photo {
  @PrimaryGeneratedColumn('uuid')
  id: string;

  @Column({ name: 'firm_id', type: 'uuid' })
  firmId: string;

  @Column({ name: 'job_id', type: 'uuid' })
  jobId: string;

  @Column({ type: 'text', nullable: true })
  caption: string | null;

  @Column({ name: 'content_type', type: 'text' })
  contentType: PhotoContentType;

  @Column({ name: 'size_bytes', type: 'int' })
  sizeBytes: number;

  @Column({ type: 'int' })
  width: number;

  @Column({ type: 'int' })
  height: number;

  @Column({ name: 'taken_at', type: 'timestamptz', nullable: true })
  takenAt: Date | null;

  @Column({ name: 'original_key', type: 'text' })
  originalKey: string;

  @Column({ name: 'thumb_key', type: 'text' })
  thumbKey: string;

  @Column({ name: 'is_location_removed', type: 'boolean' })
  isLocationRemoved: boolean;

  @Column({ name: 'uploaded_by', type: 'uuid', nullable: true })
  uploadedBy: string | null;

  @Column({ name: 'idempotency_key', type: 'text', nullable: true })
  idempotencyKey: string | null;

  @CreateDateColumn({ name: 'created_at', type: 'timestamptz' })
  createdAt: Date;
}
