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
  InstantColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
} from "../../db/columns";
import { User } from "../users/users.entity";
import {
  arrivalWindows,
  type ArrivalWindow,
  type HolidayRegion,
  type MemberRole,
  type SetupStep,
} from "../../../shared/schemas";

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
  // Issue 14 settings. Database defaults are today's behaviour (Mon–Fri on site, every arrival
  // time, a reminder the working day before), so a workshop made by any code path starts there.
  @JsonColumn({ default: () => "'[1,2,3,4,5]'" }) siteWeekdays!: number[];
  @JsonColumn({ default: () => `'${JSON.stringify(arrivalWindows)}'` })
  arrivalWindows!: ArrivalWindow[];
  @Column({ type: "int", default: 1 }) reminderDays!: number;
  /** The set-up step to come back to (null: not begun, or finished). */
  @TextColumn(16, { nullable: true }) setupStep!: SetupStep | null;
  /** Null until the owner finishes or leaves the set-up: the home offers "Finish setting up". */
  @InstantColumn({ nullable: true }) setupCompletedAt!: Date | null;
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
