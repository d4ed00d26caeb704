import { useId, useState, type ReactNode } from "react";
import { Button } from "./Button";
import { FormError, Notice } from "./States";

/** What every preview row has: its number, why it cannot be added, and what it looks like a copy of. */
export interface ImportRow {
  row: number;
  problems: string[];
  duplicate: { message: string } | null;
}

interface ImportPanelProps<R extends ImportRow> {
  accept: string;
  hint: string;
  /** Reads the file on the server into rows; nothing is saved. */
  preview: (file: { fileName: string; text: string }) => Promise<R[]>;
  /** Saves the chosen rows; answers what to tell the person. */
  confirm: (rows: { row: R; addDuplicate: boolean }[]) => Promise<string>;
  /** The row's name, as its card's heading. */
  label: (row: R) => string;
  /** The row's details (e-mail, phone) and any choice it needs (a labelled select). */
  details: (row: R) => ReactNode;
  onClose: () => void;
  describeError: (error: unknown) => string;
}

/**
 * Bring records in from a file: choose it, see each row as a card (the same on a phone and a desk),
 * tick the ones to add — bad rows say why and cannot be ticked, duplicates start unticked — and add.
 */
export function ImportPanel<R extends ImportRow>(p: ImportPanelProps<R>) {
  const inputId = useId();
  const [rows, setRows] = useState<R[] | null>(null);
  const [chosen, setChosen] = useState<Set<number>>(new Set());
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState<"read" | "add" | null>(null);
  const [done, setDone] = useState<string | null>(null);

  const read = async (file: File | undefined) => {
    if (!file) return;
    setError(null);
    setDone(null);
    setBusy("read");
    try {
      const found = await p.preview({
        fileName: file.name,
        text: await file.text(),
      });
      setRows(found);
      setChosen(
        new Set(
          found
            .filter((r) => r.problems.length === 0 && !r.duplicate)
            .map((r) => r.row),
        ),
      );
    } catch (e) {
      setRows(null);
      setError(p.describeError(e));
    } finally {
      setBusy(null);
    }
  };

  const add = async () => {
    if (!rows) return;
    setError(null);
    setBusy("add");
    try {
      const picked = rows.filter((r) => chosen.has(r.row));
      setDone(
        await p.confirm(
          picked.map((row) => ({ row, addDuplicate: !!row.duplicate })),
        ),
      );
      setRows(null);
    } catch (e) {
      setError(p.describeError(e));
    } finally {
      setBusy(null);
    }
  };

  const toggle = (n: number, on: boolean) =>
    setChosen((s) => {
      const next = new Set(s);
      if (on) next.add(n);
      else next.delete(n);
      return next;
    });

  return (
    <div className="flex flex-col gap-4">
      {done ? <Notice>{done}</Notice> : null}
      <div className="flex flex-col gap-1">
        <label htmlFor={inputId} className="text-sm font-medium">
          Contacts file
        </label>
        <input
          id={inputId}
          type="file"
          accept={p.accept}
          aria-describedby={`${inputId}-hint`}
          className="max-w-full text-sm file:mr-3 file:rounded file:border file:border-rule-strong file:bg-card file:px-3 file:py-2 file:text-sm"
          onChange={(e) => {
            void read(e.target.files?.[0]);
            e.target.value = "";
          }}
        />
        <p id={`${inputId}-hint`} className="text-sm text-ink-soft">
          {p.hint}
        </p>
      </div>
      {busy === "read" ? (
        <p className="text-sm" role="status">
          Reading the file…
        </p>
      ) : null}
      <FormError message={error} />
      {rows ? (
        <>
          <p className="text-sm" role="status">
            {rows.length} {rows.length === 1 ? "row" : "rows"} found,{" "}
            {chosen.size} ticked to add. Nothing is saved until you add them.
          </p>
          <ul
            aria-label="Rows in the file"
            className="grid gap-3 md:grid-cols-2"
          >
            {rows.map((r) => {
              const bad = r.problems.length > 0;
              const boxId = `${inputId}-row-${r.row}`;
              return (
                <li
                  key={r.row}
                  className={
                    bad
                      ? "flex flex-col gap-2 rounded border border-risk/40 bg-risk-wash p-3"
                      : "flex flex-col gap-2 rounded border border-rule bg-card p-3"
                  }
                >
                  <div className="flex items-start gap-2">
                    <input
                      id={boxId}
                      type="checkbox"
                      className="mt-1 size-4 accent-accent"
                      disabled={bad}
                      checked={chosen.has(r.row)}
                      onChange={(e) => toggle(r.row, e.target.checked)}
                    />
                    <label htmlFor={boxId} className="min-w-0 font-semibold">
                      <span className="text-ink-soft">Row {r.row}: </span>
                      {p.label(r) || "(no name)"}
                    </label>
                  </div>
                  <div className="min-w-0 text-sm">{p.details(r)}</div>
                  {bad ? (
                    <ul className="text-sm font-medium text-risk">
                      {r.problems.map((x) => (
                        <li key={x}>{x}</li>
                      ))}
                    </ul>
                  ) : null}
                  {r.duplicate ? (
                    <p className="text-sm text-wait-ink">
                      {r.duplicate.message}. Tick it to add it anyway.
                    </p>
                  ) : null}
                </li>
              );
            })}
          </ul>
        </>
      ) : null}
      <div className="flex flex-wrap gap-2">
        {rows ? (
          <Button
            busy={busy === "add"}
            disabled={busy !== null || chosen.size === 0}
            onClick={add}
          >
            Add {chosen.size} ticked {chosen.size === 1 ? "row" : "rows"}
          </Button>
        ) : null}
        <Button variant="secondary" onClick={p.onClose}>
          {done ? "Close" : "Cancel"}
        </Button>
      </div>
    </div>
  );
}
