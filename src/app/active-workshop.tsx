import {
  createContext,
  useContext,
  useMemo,
  useState,
  type ReactNode,
} from "react";
import type { Membership } from "../features/auth/viewer";

interface ActiveWorkshop {
  /** The workshop a member is working in now; null for trades and customers. */
  active: Membership | null;
  memberships: Membership[];
  choose: (workshopId: string) => void;
}

const ActiveWorkshopContext = createContext<ActiveWorkshop | null>(null);
const STORAGE_KEY = "sitecue.activeWorkshop";

function readStored(): string | null {
  try {
    return window.localStorage.getItem(STORAGE_KEY);
  } catch {
    return null;
  }
}

/** Remembers which workshop a member of several is looking at, across reloads. */
export function ActiveWorkshopProvider({
  memberships,
  children,
}: {
  memberships: Membership[];
  children: ReactNode;
}) {
  const [chosenId, setChosenId] = useState<string | null>(readStored);
  const value = useMemo<ActiveWorkshop>(() => {
    const active =
      memberships.find((m) => m.workshopId === chosenId) ??
      memberships[0] ??
      null;
    return {
      active,
      memberships,
      choose: (workshopId) => {
        setChosenId(workshopId);
        try {
          window.localStorage.setItem(STORAGE_KEY, workshopId);
        } catch {
          // Private browsing may refuse storage; the choice then lasts for this page only.
        }
      },
    };
  }, [memberships, chosenId]);
  return (
    <ActiveWorkshopContext.Provider value={value}>
      {children}
    </ActiveWorkshopContext.Provider>
  );
}

export function useActiveWorkshop(): ActiveWorkshop {
  const value = useContext(ActiveWorkshopContext);
  if (!value)
    throw new Error(
      "useActiveWorkshop must be used inside the signed-in app shell",
    );
  return value;
}
