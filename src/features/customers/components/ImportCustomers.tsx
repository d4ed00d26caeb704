import type { CustomerImportPreview } from "../../../../shared/schemas";
import { ImportPanel } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import {
  previewCustomerImport,
  useConfirmCustomerImport,
} from "../api/import-customers";

type Row = CustomerImportPreview["rows"][number];

/** Customers from a spreadsheet saved as CSV: preview, choose, add. */
export function ImportCustomers({
  workshopId,
  onClose,
}: {
  workshopId: string;
  onClose: () => void;
}) {
  const confirm = useConfirmCustomerImport(workshopId);
  return (
    <ImportPanel<Row>
      accept=".csv,text/csv"
      hint="A spreadsheet saved as CSV with a header row: Name, Email, Phone."
      describeError={errorMessage}
      onClose={onClose}
      preview={async (file) =>
        (await previewCustomerImport(workshopId, file)).rows
      }
      confirm={async (chosen) => {
        const res = await confirm.mutateAsync({
          rows: chosen.map(({ row, addDuplicate }) => ({
            row: row.row,
            name: row.name,
            email: row.email,
            phone: row.phone,
            addDuplicate,
          })),
        });
        const n = res.added.length;
        return `${n} ${n === 1 ? "customer" : "customers"} added${res.skipped.length ? `; ${res.skipped.length} left out as already kept` : ""}.`;
      }}
      label={(r) => r.name}
      details={(r) => (
        <>
          <span className="block break-all">
            {r.email || "No e-mail address"}
          </span>
          <span className="block font-mono">{r.phone || "No phone"}</span>
        </>
      )}
    />
  );
}
