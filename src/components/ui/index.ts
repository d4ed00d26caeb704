export { Button, LinkButton, buttonClasses } from "./Button";
export { TextField, TextArea, Select, WeekdayPicker } from "./Field";
export { Card, Section } from "./Card";
export {
  PartyChip,
  StatusBadge,
  JobStatusBadge,
  BookingStateBadge,
  TaskStatusBadge,
} from "./Badge";
export {
  Spinner,
  LoadingState,
  EmptyState,
  ErrorState,
  FormError,
  Notice,
  CautionNote,
} from "./States";
export { PageHeader } from "./PageHeader";
export { ProgressBar } from "./ProgressBar";
export { cx } from "./cx";
export { ImportPanel, type ImportRow } from "./ImportPanel";
