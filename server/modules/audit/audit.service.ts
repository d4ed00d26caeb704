import type { EntityManager } from "typeorm";
import { newId } from "../../db/columns";
import { AuditEntry } from "./audit.entity";

export interface AuditInput {
  workshopId: string | null;
  actorUserId: string | null;
  action: string;
  entityType: string;
  entityId: string | null;
  detail?: Record<string, unknown>;
}

/** Records who changed what; call inside the same transaction as the change. */
export async function audit(
  manager: EntityManager,
  input: AuditInput,
): Promise<void> {
  await manager.insert(AuditEntry, {
    id: newId(),
    ...input,
    detail: (input.detail ?? {}) as never,
  });
}
