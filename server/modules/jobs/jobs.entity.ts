import {
  Column,
  Entity,
  Index,
  JoinColumn,
  ManyToOne,
  VersionColumn,
  type Relation,
} from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  JsonColumn,
  LocalDateColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import { Workshop } from "../workshops/workshops.entity";
import { Customer } from "../customers/customers.entity";
import {
  jobStatuses,
  type HolidayRegion,
  type JobStatus,
} from "../../../shared/schemas";

/** One customer's install at one site. `version` guards the programme against lost updates. */
@Entity("jobs")
@Index("ix_jobs_workshop_status", ["workshopId", "status"])
export class Job {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @Index("ix_jobs_customer")
  @RefColumn()
  customerId!: string;
  @TextColumn(160) title!: string;
  @TextColumn(300) siteAddress!: string;
  @TextColumn(10) postcode!: string;
  /** Town or area: what a trade sees before they confirm. */
  @TextColumn(120) area!: string;
  @TextColumn(8) holidayRegion!: HolidayRegion;
  @TextColumn(64) timeZone!: string;
  @Column({ type: "enum", enum: jobStatuses }) status!: JobStatus;
  @LocalDateColumn({ nullable: true }) handoverDate!: string | null;
  /** ISO weekdays on which the customer can let trades in. */
  @JsonColumn() siteWeekdays!: number[];
  /** Local dates the site is closed (the customer is away). */
  @JsonColumn() siteClosedDates!: string[];
  @Column({ type: "text" }) accessNotes!: string;
  @VersionColumn({ type: "int" }) version!: number;
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;

  @ManyToOne(() => Workshop, { onDelete: "CASCADE" })
  @JoinColumn({ name: "workshopId" })
  workshop?: Relation<Workshop>;
  @ManyToOne(() => Customer, { onDelete: "RESTRICT" })
  @JoinColumn({ name: "customerId" })
  customer?: Relation<Customer>;
}
