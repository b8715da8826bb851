import { Link as RouterLink, type LinkProps } from "react-router-dom";
import { cn } from "@/utils/cn";

/** An in-app text link in the accent colour. */
export function TextLink({ className, ...props }: LinkProps) {
  return (
    <RouterLink
      className={cn(
        "font-semibold text-signal-300 underline decoration-signal-600/60 underline-offset-2 hover:text-signal-200",
        "focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-signal-300",
        className,
      )}
      {...props}
    />
  );
}
