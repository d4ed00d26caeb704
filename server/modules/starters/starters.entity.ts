import { Entity, Index } from "typeorm";
import {
  CreatedColumn,
  IdColumn,
  JsonColumn,
  RefColumn,
  TextColumn,
  UpdatedColumn,
} from "../../db/columns";
import type { StarterLink, StarterTask } from "../../../shared/schemas";

/** An editable starting programme for a common kind of job (tasks, parties, links, trade defaults). */
@Entity("programme_starters")
@Index("ix_programme_starters_workshop", ["workshopId"])
export class ProgrammeStarter {
  @IdColumn() id!: string;
  @RefColumn() workshopId!: string;
  @TextColumn(120) name!: string;
  @TextColumn(300) description!: string;
  @JsonColumn() tasks!: StarterTask[];
  @JsonColumn() links!: StarterLink[];
  @CreatedColumn() createdAt!: Date;
  @UpdatedColumn() updatedAt!: Date;
}
