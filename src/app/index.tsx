import { useState } from "react";
import { RouterProvider } from "react-router-dom";
import { AppProvider } from "@/app/provider";
import { createAppRouter } from "@/app/router";
import { setUnauthenticatedHandler } from "@/lib/api-client";
import { createQueryClient } from "@/lib/query-client";
import { getMeQueryOptions } from "@/features/auth/api/get-me";

/** The whole client: one QueryClient, one router, and what to do when the session is gone. */
export function App() {
  const [{ queryClient, router }] = useState(() => {
    const queryClient = createQueryClient();
    // A 401 on any read but /auth/me means the session ended (expired, signed out elsewhere,
    // deactivated). Forgetting the user makes the app frame send the person to sign-in.
    setUnauthenticatedHandler(() => queryClient.setQueryData(getMeQueryOptions().queryKey, null));
    return { queryClient, router: createAppRouter(queryClient) };
  });

  return (
    <AppProvider queryClient={queryClient}>
      <RouterProvider router={router} />
    </AppProvider>
  );
}
