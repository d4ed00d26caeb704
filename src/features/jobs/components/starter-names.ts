import { useStarters } from "../api/list-starters";

/** The workshop's starters in words, "alcove cabinets (pair), fitted wardrobe …"; null while loading. */
export function useStarterNames(workshopId: string): string | null {
  const starters = useStarters(workshopId);
  const names = (starters.data?.starters ?? []).map((s) =>
    s.name.toLowerCase(),
  );
  if (!names.length) return null;
  return names.length > 3
    ? `${names.slice(0, 3).join(", ")} …`
    : names.join(", ");
}
