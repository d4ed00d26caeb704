import { zodResolver } from "@hookform/resolvers/zod";
import { Controller, useForm } from "react-hook-form";
import type { z } from "zod";
import {
  tradeBodySchema,
  tradeKinds,
  type TradeResponse,
} from "../../../../shared/schemas";
import {
  Button,
  FormError,
  Select,
  TextField,
  WeekdayPicker,
} from "../../../components/ui";
import { applyServerErrors } from "../../../lib/form-errors";
import { partyLabels } from "../../../lib/labels";
import { useCreateTrade } from "../api/create-trade";
import { useUpdateTrade } from "../api/update-trade";

type Input = z.input<typeof tradeBodySchema>;
type Output = z.output<typeof tradeBodySchema>;

const FIELDS = [
  "businessName",
  "kind",
  "contactName",
  "email",
  "phone",
  "workingWeekdays",
  "dayStart",
  "dayEnd",
];

/** Add a trade, or edit one (`trade`): the same schema and fields either way. */
export function AddTradeForm({
  workshopId,
  trade,
  onAdded,
  onCancel,
}: {
  workshopId: string;
  /** The trade to edit; the form starts from its details and saves them with PATCH. */
  trade?: TradeResponse;
  onAdded: () => void;
  onCancel: () => void;
}) {
  const created = useCreateTrade(workshopId);
  const updated = useUpdateTrade();
  const create = trade ? updated : created;
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(tradeBodySchema),
    defaultValues: trade
      ? {
          businessName: trade.businessName,
          kind: trade.kind,
          contactName: trade.contactName,
          email: trade.email,
          phone: trade.phone,
          workingWeekdays: trade.workingWeekdays,
          dayStart: trade.dayStart,
          dayEnd: trade.dayEnd,
          daysOff: trade.daysOff,
        }
      : {
          businessName: "",
          kind: "plasterer",
          contactName: "",
          email: "",
          phone: "",
          workingWeekdays: [1, 2, 3, 4, 5],
          dayStart: "08:00",
          dayEnd: "16:30",
          daysOff: [],
        },
  });
  const { errors } = form.formState;
  const formError = create.isError
    ? applyServerErrors(create.error, form.setError, FIELDS)
    : null;

  const onSuccess = () => {
    form.reset();
    onAdded();
  };
  const onSubmit = form.handleSubmit((body) =>
    trade
      ? updated.mutate({ tradeId: trade.id, body }, { onSuccess })
      : created.mutate(body, { onSuccess }),
  );

  return (
    <form
      onSubmit={onSubmit}
      noValidate
      aria-label={trade ? `Edit ${trade.businessName}` : "Add a trade"}
      className="grid gap-4 md:grid-cols-2"
    >
      <FormError className="md:col-span-2" message={formError} />
      <TextField
        label="Business name"
        autoFocus
        error={errors.businessName?.message}
        {...form.register("businessName")}
      />
      <Select
        label="Trade"
        error={errors.kind?.message}
        {...form.register("kind")}
      >
        {tradeKinds.map((k) => (
          <option key={k} value={k}>
            {partyLabels[k]}
          </option>
        ))}
      </Select>
      <TextField
        label="Contact name"
        hint="Who to ask for."
        error={errors.contactName?.message}
        {...form.register("contactName")}
      />
      <TextField
        label="E-mail"
        type="email"
        error={errors.email?.message}
        {...form.register("email")}
      />
      <TextField
        label="Phone"
        type="tel"
        error={errors.phone?.message}
        {...form.register("phone")}
      />
      {/* Plain text boxes, not type="time": the browser would show a 12-hour clock in
          some locales, and Sitecue writes times on the 24-hour clock. */}
      <div className="grid grid-cols-2 gap-3">
        <TextField
          label="Day starts"
          inputMode="numeric"
          placeholder="08:00"
          maxLength={5}
          inputClassName="font-mono"
          error={errors.dayStart?.message}
          {...form.register("dayStart")}
        />
        <TextField
          label="Day ends"
          inputMode="numeric"
          placeholder="16:30"
          maxLength={5}
          inputClassName="font-mono"
          error={errors.dayEnd?.message}
          {...form.register("dayEnd")}
        />
      </div>
      <div className="md:col-span-2">
        <Controller
          control={form.control}
          name="workingWeekdays"
          render={({ field }) => (
            <WeekdayPicker
              legend="Working days"
              value={field.value ?? []}
              onChange={field.onChange}
              error={errors.workingWeekdays?.message}
            />
          )}
        />
      </div>
      <div className="flex flex-wrap gap-2 md:col-span-2">
        <Button type="submit" busy={create.isPending}>
          {trade ? "Save changes" : "Add trade"}
        </Button>
        <Button variant="secondary" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
