// Moved to src/components so the calendars show the same knock-on panel.
export {
  handoverSentence,
  ImpactSummary,
  KnockOnPanel,
  movesSentence,
} from "../../../components/KnockOnPanel";
