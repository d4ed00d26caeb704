// How the screens read the engine's `waiting` when nothing is left to do but wait: the engine's
// readiness is `clear` only when every link is met at the data date's first slot (spec, "Outputs
// per task"), so a template whose carcasses were finished today is `waiting` until tomorrow.
// The brief's scenario 1 says that as "clear to start from the next working day".

/**
 * When everything a waiting task waits for is done, the first start its links allow (the latest
 * of them); null while some predecessor still has work left, or when it waits on nothing.
 */
export function clearFromWhenDone(
  waitingOn: ReadonlyArray<{ allowsFrom: string; done: boolean }>,
): string | null {
  if (waitingOn.length === 0 || !waitingOn.every((w) => w.done)) return null;
  return waitingOn
    .map((w) => w.allowsFrom)
    .sort()
    .at(-1)!;
}
