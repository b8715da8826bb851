import { RouterProvider } from "react-router-dom";
import { AppProvider } from "@/app/provider";
import { createAppRouter } from "@/app/router";
import { setUnauthenticatedHandler } from "@/lib/api-client";
import { createQueryClient } from "@/lib/query-client";
import { getMeQueryOptions } from "@/features/auth/api/get-me";

// One QueryClient and one router for the page's lifetime. They live at module level, not in
// component state: StrictMode runs state initialisers twice, and the 401 handler must point at
// the client actually in use.
const queryClient = createQueryClient();

// A 401 on anything but /auth/me means the session ended (expired, signed out elsewhere,
// deactivated). Forgetting the user makes the app frame send the person to sign-in.
setUnauthenticatedHandler(() => queryClient.setQueryData(getMeQueryOptions().queryKey, null));

const router = createAppRouter(queryClient);

/** The whole client. */
export function App() {
  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
