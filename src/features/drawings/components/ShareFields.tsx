import { partyLabels } from "../../../lib/labels";
import type { TradeKind } from "../../../../shared/schemas";
import type { ShareOptions, ShareValue } from "../share";
import { CheckGroup } from "./FilePicker";

/** Share with: trade kinds on the job, named trades on the job, the customer. */
export function ShareFields({
  options,
  value,
  onChange,
  disabled,
}: {
  options: ShareOptions;
  value: ShareValue;
  onChange: (next: ShareValue) => void;
  disabled?: boolean;
}) {
  return (
    <fieldset className="flex flex-col gap-3 rounded border border-rule p-3">
      <legend className="px-1 text-sm font-semibold">Share with</legend>
      <p className="text-sm text-ink-soft">
        The workshop always sees it. Trades and the customer see only what is
        shared with them.
      </p>
      {options.tradeKinds.length > 0 ? (
        <CheckGroup
          legend="Trade kinds on this job"
          hint="Every trade of that kind booked on the job, now or later."
          options={options.tradeKinds.map((k) => ({
            value: k,
            label: partyLabels[k],
          }))}
          value={value.tradeKinds}
          onChange={(v) => onChange({ ...value, tradeKinds: v as TradeKind[] })}
          disabled={disabled}
        />
      ) : null}
      {options.trades.length > 0 ? (
        <CheckGroup
          legend="Named trades on this job"
          options={options.trades.map((t) => ({
            value: t.id,
            label: t.name,
            detail: partyLabels[t.kind],
          }))}
          value={value.tradeIds}
          onChange={(v) => onChange({ ...value, tradeIds: v })}
          disabled={disabled}
        />
      ) : null}
      {options.customerName ? (
        <CheckGroup
          legend="The customer"
          options={[
            {
              value: "customer",
              label: options.customerName,
              detail: "Customer",
            },
          ]}
          value={value.customer ? ["customer"] : []}
          onChange={(v) => onChange({ ...value, customer: v.length > 0 })}
          disabled={disabled}
        />
      ) : null}
    </fieldset>
  );
}
