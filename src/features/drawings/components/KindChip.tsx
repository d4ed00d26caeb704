import {
  drawingKindLabels,
  type DrawingKind,
} from "../../../../shared/schemas";
import { cx } from "../../../components/ui";

// A small mark per kind, decoration beside the word (never the only signal).
const mark: Record<DrawingKind, string> = {
  drawing: "border-accent bg-accent-wash",
  template: "border-trade-plasterer bg-paper",
  site_photo: "border-ok bg-ok-wash",
};

/** "Drawing", "Template" or "Site photo" as a chip. */
export function KindChip({ kind }: { kind: DrawingKind }) {
  return (
    <span className="inline-flex items-center gap-1.5 whitespace-nowrap rounded border border-rule bg-paper px-2 py-0.5 text-xs font-medium text-ink">
      <span
        aria-hidden="true"
        className={cx("size-2.5 rotate-45 border", mark[kind])}
      />
      {drawingKindLabels[kind]}
    </span>
  );
}

/** "Rev B" in the figures face, as drawing offices write it. */
export function RevLabel({
  letter,
  current,
}: {
  letter: string;
  current?: boolean;
}) {
  return (
    <span
      className={cx(
        "inline-flex items-center whitespace-nowrap rounded border px-1.5 py-0.5 font-mono text-xs font-medium",
        current
          ? "border-accent/40 bg-accent-wash text-accent-strong"
          : "border-rule bg-paper text-ink",
      )}
    >
      Rev {letter}
    </span>
  );
}
