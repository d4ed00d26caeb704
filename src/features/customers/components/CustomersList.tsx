import type { CustomerResponse } from "../../../../shared/schemas";

/** The workshop's customers with their contact details (the workshop's own records). */
export function CustomersList({
  customers,
}: {
  customers: CustomerResponse[];
}) {
  return (
    <ul
      aria-label="Customers"
      className="flex flex-col divide-y divide-rule rounded border border-rule bg-card"
    >
      {customers.map((c) => (
        <li
          key={c.id}
          className="grid gap-1 px-4 py-3 md:grid-cols-[minmax(0,1.2fr)_minmax(0,1.4fr)_minmax(0,1fr)] md:gap-4"
        >
          <span className="font-semibold">
            {c.name}
            {c.hasAccount ? (
              <span className="ml-2 text-xs font-normal text-ink-soft">
                Has signed in
              </span>
            ) : null}
          </span>
          <a
            href={`mailto:${c.email}`}
            className="min-w-0 break-all text-sm text-accent underline underline-offset-2"
          >
            {c.email}
          </a>
          {c.phone ? (
            <a
              href={`tel:${c.phone.replace(/[^+0-9]/g, "")}`}
              className="font-mono text-sm text-accent underline underline-offset-2"
            >
              {c.phone}
            </a>
          ) : (
            <span className="text-sm text-ink-soft">No phone</span>
          )}
        </li>
      ))}
    </ul>
  );
}
