import type { ReactNode } from "react";
import { NavLink } from "react-router-dom";
import { Wordmark } from "@/components/layouts/brand-mark";
import { Badge } from "@/components/ui/badge";
import { Button } from "@/components/ui/button";
import { cn } from "@/utils/cn";

export type NavItem = { name: string; to: string; end?: boolean };

export type AppLayoutProps = {
  navItems: NavItem[];
  user: { name: string; email: string; roles: readonly string[] };
  onSignOut: () => void;
  signingOut: boolean;
  /** Small status line at the foot of the navigation (server health). */
  status?: ReactNode;
  children: ReactNode;
};

/** The signed-in frame: navigation rail at the left (top on narrow screens), page at the right. */
export function AppLayout({ navItems, user, onSignOut, signingOut, status, children }: AppLayoutProps) {
  return (
    <div className="flex min-h-screen flex-col md:flex-row">
      <aside className="flex shrink-0 flex-col gap-6 border-b border-ink-800 bg-ink-900 px-4 py-4 md:sticky md:top-0 md:h-screen md:w-60 md:border-r md:border-b-0 md:py-6">
        <Wordmark />
        <nav aria-label="Main">
          <ul className="flex gap-1 md:flex-col">
            {navItems.map((item) => (
              <li key={item.to}>
                <NavLink
                  to={item.to}
                  end={item.end}
                  className={({ isActive }) =>
                    cn(
                      "block rounded-md border-l-2 px-3 py-2 text-sm font-semibold transition-colors",
                      "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal-300",
                      isActive
                        ? "border-signal-400 bg-ink-800 text-signal-300"
                        : "border-transparent text-paper-200 hover:bg-ink-800 hover:text-paper-50",
                    )
                  }
                >
                  {item.name}
                </NavLink>
              </li>
            ))}
          </ul>
        </nav>
        <div className="flex flex-col gap-3 md:mt-auto">
          <div className="rounded-md border border-ink-700 bg-ink-950/60 px-3 py-2.5">
            <p className="truncate text-sm font-semibold text-paper-50" title={user.email}>
              {user.name}
            </p>
            <p className="truncate text-xs text-ink-300">{user.email}</p>
            <ul aria-label="Your roles" className="mt-2 flex flex-wrap gap-1">
              {user.roles.map((role) => (
                <li key={role}>
                  <Badge tone="signal">{role}</Badge>
                </li>
              ))}
            </ul>
          </div>
          <Button variant="secondary" size="sm" onClick={onSignOut} pending={signingOut}>
            Sign out
          </Button>
          {status}
        </div>
      </aside>
      <main className="min-w-0 flex-1 px-4 py-6 md:px-10 md:py-8">{children}</main>
    </div>
  );
}
