import { useOutletContext } from "react-router-dom";
import type { AuthUserView as User } from "@shared/contracts";

/** What the app frame hands to every signed-in page. */
export type AppOutletContext = { user: User };

/** The signed-in person; only valid inside the app frame, which renders pages only when signed in. */
export function useAppUser(): User {
  return useOutletContext<AppOutletContext>().user;
}
