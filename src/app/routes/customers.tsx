import { useState } from "react";
import { useCustomers } from "../../features/customers/api/list-customers";
import { customersCsvUrl } from "../../features/customers/api/import-customers";
import { AddCustomerForm } from "../../features/customers/components/AddCustomerForm";
import { CustomersList } from "../../features/customers/components/CustomersList";
import { ImportCustomers } from "../../features/customers/components/ImportCustomers";
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

/** The workshop's customers: add one, bring many in from a spreadsheet, take them out as CSV. */
export function CustomersRoute() {
  const { active } = useActiveWorkshop();
  if (!active) return <MembersOnly title="Customers" />;
  return (
    <CustomersPage
      workshopId={active.workshopId}
      workshopName={active.workshopName}
    />
  );
}

function CustomersPage({
  workshopId,
  workshopName,
}: {
  workshopId: string;
  workshopName: string;
}) {
  const customers = useCustomers(workshopId);
  const [adding, setAdding] = useState(false);
  const [importing, setImporting] = useState(false);
  const [added, setAdded] = useState<string | null>(null);
  return (
    <>
      <PageHeader
        title="Customers"
        eyebrow={workshopName}
        description="The householders whose jobs this workshop fits."
        actions={
          <div className="flex flex-wrap gap-2">
            {!adding ? (
              <Button
                onClick={() => {
                  setAdding(true);
                  setAdded(null);
                }}
              >
                Add customer
              </Button>
            ) : null}
            {!importing ? (
              <Button variant="secondary" onClick={() => setImporting(true)}>
                Import customers (CSV)
              </Button>
            ) : null}
            <a
              href={customersCsvUrl(workshopId)}
              download
              className={buttonClasses("secondary")}
            >
              Export CSV
            </a>
          </div>
        }
      />
      {adding ? (
        <Section title="Add a customer" className="mb-6">
          <AddCustomerForm
            workshopId={workshopId}
            onCreated={(c) => {
              setAdding(false);
              setAdded(`${c.name} added.`);
            }}
            onCancel={() => setAdding(false)}
          />
        </Section>
      ) : null}
      {importing ? (
        <Section title="Import customers (CSV)" className="mb-6">
          <ImportCustomers
            workshopId={workshopId}
            onClose={() => setImporting(false)}
          />
        </Section>
      ) : null}
      {added ? (
        <div className="mb-4">
          <Notice>{added}</Notice>
        </div>
      ) : null}
      {customers.isPending ? (
        <LoadingState label="Loading customers…" />
      ) : customers.isError ? (
        <ErrorState
          error={customers.error}
          onRetry={() => customers.refetch()}
        />
      ) : customers.data.length === 0 ? (
        <EmptyState title="No customers yet">
          Add the householders you fit for, or bring them in from a spreadsheet,
          so each job knows whose home it is.
        </EmptyState>
      ) : (
        <CustomersList customers={customers.data} />
      )}
    </>
  );
}
