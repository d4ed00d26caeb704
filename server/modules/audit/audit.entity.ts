import { Entity, Index } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";

/** Who changed what, when. Never updated or deleted by the app. */
@Entity("audit_entries")
@Index("ix_audit_workshop_time", ["workshopId", "createdAt"])
export class AuditEntry {
  @IdColumn() id!: string;
  @RefColumn({ nullable: true }) workshopId!: string | null;
  @RefColumn({ nullable: true }) actorUserId!: string | null;
  @TextColumn(64) action!: string;
  @TextColumn(32) entityType!: string;
  @Index("ix_audit_entity")
  @RefColumn({ nullable: true })
  entityId!: string | null;
  @JsonColumn() detail!: Record<string, unknown>;
  @CreatedColumn() createdAt!: Date;
}
