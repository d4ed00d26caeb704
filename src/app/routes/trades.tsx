import { useState } from "react";
import { useTrades } from "../../features/trades/api/list-trades";
import { AddTradeForm } from "../../features/trades/components/AddTradeForm";
import { ImportTrades } from "../../features/trades/components/ImportTrades";
import { tradesCsvUrl } from "../../features/trades/api/import-trades";
import { TradesList } from "../../features/trades/components/TradesList";
import {
  Button,
  buttonClasses,
  EmptyState,
  ErrorState,
  LoadingState,
  Notice,
  PageHeader,
  Section,
} from "../../components/ui";
import { useActiveWorkshop } from "../active-workshop";
import { MembersOnly } from "./members-only";

export function TradesRoute() {
  const { active } = useActiveWorkshop();
  if (!active) return <MembersOnly title="Trades" />;
  return (
    <TradesPage
      workshopId={active.workshopId}
      workshopName={active.workshopName}
      isOwner={active.role === "owner"}
    />
  );
}

function TradesPage({
  workshopId,
  workshopName,
  isOwner,
}: {
  workshopId: string;
  workshopName: string;
  isOwner: boolean;
}) {
  const trades = useTrades(workshopId);
  const [adding, setAdding] = useState(false);
  const [added, setAdded] = useState(false);
  const [importing, setImporting] = useState(false);

  return (
    <>
      <PageHeader
        title="Trades"
        eyebrow={workshopName}
        description="The trades this workshop books, with their working days."
        actions={
          <div className="flex flex-wrap gap-2">
            {!adding ? (
              <Button
                onClick={() => {
                  setAdding(true);
                  setAdded(false);
                }}
              >
                Add trade
              </Button>
            ) : null}
            {!importing ? (
              <Button variant="secondary" onClick={() => setImporting(true)}>
                Import contacts (vCard or CSV)
              </Button>
            ) : null}
            {/* A plain download: the session cookie goes with it, and the server names the file. */}
            <a
              href={tradesCsvUrl(workshopId)}
              download
              className={buttonClasses("secondary")}
            >
              Export CSV
            </a>
          </div>
        }
      />
      {importing ? (
        <Section title="Import contacts (vCard or CSV)" className="mb-6">
          <ImportTrades
            workshopId={workshopId}
            onClose={() => setImporting(false)}
          />
        </Section>
      ) : null}
      {adding ? (
        <Section title="Add a trade" className="mb-6">
          <AddTradeForm
            workshopId={workshopId}
            onAdded={() => {
              setAdding(false);
              setAdded(true);
            }}
            onCancel={() => setAdding(false)}
          />
        </Section>
      ) : null}
      {added ? (
        <div className="mb-4">
          <Notice>Trade added.</Notice>
        </div>
      ) : null}
      {trades.isPending ? (
        <LoadingState label="Loading trades…" />
      ) : trades.isError ? (
        <ErrorState error={trades.error} onRetry={() => trades.refetch()} />
      ) : trades.data.length === 0 ? (
        <EmptyState
          title="No trades yet"
          action={
            !adding ? (
              <Button onClick={() => setAdding(true)}>
                Add the first trade
              </Button>
            ) : null
          }
        >
          Add the plasterers, decorators, electricians and others you book, so
          jobs can be planned around them.
        </EmptyState>
      ) : (
        <TradesList
          trades={trades.data}
          canDelete={isOwner}
          canEdit
          workshopId={workshopId}
        />
      )}
    </>
  );
}
