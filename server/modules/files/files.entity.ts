import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  type Relation,
} from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { Workshop } from "../workshops/workshops.entity";

/**
 * One uploaded file in the bucket: a drawing revision, a template, a site photo or a thread
 * attachment. The type is the one sniffed from the content, never the browser's claim.
 */
@Entity("stored_files")
export class StoredFile {
  @IdColumn() id!: string;
  @Index("ix_stored_files_workshop")
  @RefColumn()
  workshopId!: string;
  /** The object's key in the bucket: made by Sitecue, never from the uploaded name. */
  @TextColumn(200) storageKey!: string;
  /** The uploaded name, cleaned (no folders, no control characters), for downloads. */
  @TextColumn(255) originalName!: string;
  @TextColumn(100) mimeType!: string;
  @TextColumn(10) extension!: string;
  @Column({ type: "int" }) sizeBytes!: number;
  @Column({ type: "char", length: 64 }) sha256!: string;
  @Column({ type: "int", nullable: true }) width!: number | null;
  @Column({ type: "int", nullable: true }) height!: number | null;
  @TextColumn(200, { nullable: true }) thumbnailKey!: string | null;
  @RefColumn() uploadedByUserId!: string;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
}
