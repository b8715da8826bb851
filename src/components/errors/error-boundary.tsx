import { Component, type ErrorInfo, type ReactNode } from "react";

export type ErrorFallbackProps = { error: Error; reset: () => void };

type Props = {
  children: ReactNode;
  fallback: (props: ErrorFallbackProps) => ReactNode;
  /** When this value changes (e.g. the location), a shown error is cleared and children retried. */
  resetKey?: unknown;
  onReset?: () => void;
};

type State = { error: Error | null };

/** Catches render errors in one page region so the rest of the page keeps working. */
export class ErrorBoundary extends Component<Props, State> {
  state: State = { error: null };

  static getDerivedStateFromError(error: unknown): State {
    return { error: error instanceof Error ? error : new Error(String(error)) };
  }

  componentDidCatch(error: Error, info: ErrorInfo): void {
    console.error("Lotwise region failed", error, info.componentStack);
  }

  componentDidUpdate(previous: Props): void {
    if (this.state.error && previous.resetKey !== this.props.resetKey) this.reset();
  }

  reset = (): void => {
    this.props.onReset?.();
    this.setState({ error: null });
  };

  render(): ReactNode {
    if (this.state.error) return this.props.fallback({ error: this.state.error, reset: this.reset });
    return this.props.children;
  }
}
