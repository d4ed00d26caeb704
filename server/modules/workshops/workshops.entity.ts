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
  JsonColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { User } from "../users/users.entity";
import type { HolidayRegion, MemberRole } from "../../../shared/schemas";

/** The maker's business: the tenant every other record is scoped to. */
@Entity("workshops")
export class Workshop {
  @IdColumn() id!: string;
  @TextColumn(120) name!: string;
  @TextColumn(120) town!: string;
  @TextColumn(64) timeZone!: string;
  @TextColumn(8, { nullable: true }) holidayRegion!: HolidayRegion | null;
  @JsonColumn() workingWeekdays!: number[];
  @TextColumn(5) dayStart!: string;
  @TextColumn(5) dayEnd!: string;
  @CreatedColumn() createdAt!: Date;
}

/** A person's seat in a workshop: owner or fitter. */
@Entity("workshop_members")
@Index("uq_workshop_members", ["workshopId", "userId"], { unique: true })
export class WorkshopMember {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @Index("ix_workshop_members_user")
  @RefColumn()
  userId!: string;
  @Column({ type: "enum", enum: ["owner", "fitter"] }) role!: MemberRole;
  @CreatedColumn() createdAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => User, { onDelete: "CASCADE" })
  @JoinColumn({ name: "userId" })
  user?: Relation<User>;
}
