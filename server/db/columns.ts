import { randomUUID } from "node:crypto";
import {
  Column,
  CreateDateColumn,
  PrimaryColumn,
  UpdateDateColumn,
  type ColumnOptions,
} from "typeorm";

// tsx emits no decorator metadata, so every column names its type and length explicitly.

/** Primary key: a UUID made by the server (never by the database, so ids exist before insert). */
export const IdColumn = () => PrimaryColumn({ type: "char", length: 36 });
export const RefColumn = (opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "char", length: 36, ...opts });
export const TextColumn = (length: number, opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "varchar", length, ...opts });
/** A wall-clock local date "YYYY-MM-DD" in the job's time zone: not an instant. */
export const LocalDateColumn = (opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "varchar", length: 10, ...opts });
/** A wall-clock local date-time "YYYY-MM-DDTHH:mm" in the job's time zone: not an instant. */
export const LocalDateTimeColumn = (opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "varchar", length: 16, ...opts });
export const JsonColumn = (opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "json", ...opts });
export const InstantColumn = (opts: Partial<ColumnOptions> = {}) =>
  Column({ type: "datetime", precision: 3, ...opts });
export const CreatedColumn = () =>
  CreateDateColumn({ type: "datetime", precision: 3 });
export const UpdatedColumn = () =>
  UpdateDateColumn({ type: "datetime", precision: 3 });

export const newId = () => randomUUID();
