import type { EntityManager } from "typeorm";
import type { Actor } from "../../policies";
import type { SessionUser } from "../../../shared/schemas";

/** One row: the person, and their memberships, trade links and customer records as JSON arrays. */
const SESSION_USER_SQL = `
SELECT u.id, u.email, u.name, u.emailVerifiedAt, u.sessionGeneration,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT(
      'workshopId', wm.workshopId, 'workshopName', COALESCE(w.name, ''), 'role', wm.role))
     FROM workshop_members wm LEFT JOIN workshops w ON w.id = wm.workshopId
    WHERE wm.userId = u.id) AS members,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT(
      'tradeId', tm.tradeId, 'workshopId', tm.workshopId, 'workshopName', COALESCE(w.name, ''),
      'businessName', t.businessName, 'kind', t.kind))
     FROM trade_members tm JOIN trades t ON t.id = tm.tradeId
     LEFT JOIN workshops w ON w.id = tm.workshopId
    WHERE tm.userId = u.id) AS trades,
  (SELECT JSON_ARRAYAGG(JSON_OBJECT(
      'customerId', c.id, 'workshopId', c.workshopId, 'workshopName', COALESCE(w.name, '')))
     FROM customers c LEFT JOIN workshops w ON w.id = c.workshopId
    WHERE c.userId = u.id) AS customers
FROM users u WHERE u.id = ?`;

interface SessionUserRow {
  id: string;
  email: string;
  name: string;
  emailVerifiedAt: Date | null;
  sessionGeneration: number;
  members: string | null;
  trades: string | null;
  customers: string | null;
}

/** A JSON_ARRAYAGG column: text from MariaDB (its JSON is LONGTEXT), NULL when no rows. */
function rowsOf<T>(value: unknown): T[] {
  if (value === null || value === undefined) return [];
  return (typeof value === "string" ? JSON.parse(value) : value) as T[];
}

/**
 * Everything a signed-in person is: their memberships, the trades they speak for, their customer
 * records. One statement, since every signed-in request runs it (issue 15); read through the
 * caller's EntityManager (inside a transaction, its own connection). Nothing is cached, so a
 * changed role or a removed membership counts on the very next request.
 */
export async function loadSessionUser(
  m: EntityManager,
  userId: string,
): Promise<{ user: SessionUser; actor: Actor; generation: number } | null> {
  const [row] = (await m.query(SESSION_USER_SQL, [userId])) as SessionUserRow[];
  if (!row) return null;
  const members = rowsOf<SessionUser["memberships"][number]>(row.members);
  const trades = rowsOf<SessionUser["trades"][number]>(row.trades);
  const customers = rowsOf<SessionUser["customers"][number]>(row.customers);
  const sessionUser: SessionUser = {
    id: row.id,
    email: row.email,
    name: row.name,
    emailVerified: row.emailVerifiedAt !== null,
    memberships: members,
    trades,
    customers,
  };
  const actor: Actor = {
    userId,
    memberships: new Map(members.map((x) => [x.workshopId, x.role])),
    trades: new Map(trades.map((t) => [t.tradeId, t.workshopId])),
    customers: new Map(customers.map((c) => [c.customerId, c.workshopId])),
  };
  return {
    user: sessionUser,
    actor,
    generation: Number(row.sessionGeneration),
  };
}
