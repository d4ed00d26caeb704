import { useState } from "react";
import {
  tradeKinds,
  type TradeImportPreview,
  type TradeKind,
} from "../../../../shared/schemas";
import { ImportPanel, Select } from "../../../components/ui";
import { errorMessage } from "../../../lib/api-client";
import { partyLabels } from "../../../lib/labels";
import {
  previewTradeImport,
  useConfirmTradeImport,
} from "../api/import-trades";

type Row = TradeImportPreview["rows"][number];

const added = (n: number, skipped: number) =>
  `${n} ${n === 1 ? "trade" : "trades"} added${skipped ? `; ${skipped} left out as already kept` : ""}.`;

/** Trades from a phone's contacts (vCard) or a spreadsheet (CSV): preview, choose each kind, add. */
export function ImportTrades({
  workshopId,
  onClose,
}: {
  workshopId: string;
  onClose: () => void;
}) {
  const confirm = useConfirmTradeImport(workshopId);
  // The kind chosen per row; a row without a guess starts with none, so it is chosen on purpose.
  const [kinds, setKinds] = useState<Record<number, TradeKind | "">>({});
  return (
    <ImportPanel<Row>
      accept=".vcf,.vcard,.csv,text/vcard,text/csv"
      hint="A .vcf file exported from a phone's contacts, or a spreadsheet saved as CSV with a header row (Business, Name, Email, Phone, Trade)."
      describeError={errorMessage}
      onClose={onClose}
      preview={async (file) => {
        const p = await previewTradeImport(workshopId, file);
        setKinds(
          Object.fromEntries(p.rows.map((r) => [r.row, r.suggestedKind ?? ""])),
        );
        return p.rows;
      }}
      confirm={async (chosen) => {
        const res = await confirm.mutateAsync({
          rows: chosen.map(({ row, addDuplicate }) => ({
            row: row.row,
            businessName: row.businessName,
            contactName: row.contactName,
            email: row.email,
            phone: row.phone,
            kind: kinds[row.row] || null,
            addDuplicate,
          })),
        });
        return added(res.added.length, res.skipped.length);
      }}
      label={(r) => r.businessName}
      details={(r) => (
        <div className="flex flex-col gap-2">
          <div>
            {r.contactName && r.contactName !== r.businessName ? (
              <span className="block">{r.contactName}</span>
            ) : null}
            <span className="block break-all">
              {r.email || "No e-mail address"}
            </span>
            <span className="block font-mono">
              {r.phone || "No phone number"}
            </span>
          </div>
          {r.problems.length === 0 ? (
            <Select
              label={`Trade for row ${r.row}`}
              hint={r.kindHint ? `From the card: ${r.kindHint}` : undefined}
              value={kinds[r.row] ?? ""}
              onChange={(e) =>
                setKinds((k) => ({
                  ...k,
                  [r.row]: e.target.value as TradeKind,
                }))
              }
            >
              <option value="">Choose…</option>
              {tradeKinds.map((k) => (
                <option key={k} value={k}>
                  {partyLabels[k]}
                </option>
              ))}
            </Select>
          ) : null}
        </div>
      )}
    />
  );
}
