import { Component, type ErrorInfo, type ReactNode } from 'react';

interface State {
  error: Error | null;
}

/** Keeps one broken page from blanking the whole app; the message shows where it happened. */
export class RouteErrorBoundary extends Component<{ children: ReactNode }, State> {
  override state: State = { error: null };

  static getDerivedStateFromError(error: Error): State {
    return { error };
  }

  override componentDidCatch(error: Error, info: ErrorInfo): void {
    console.error('Page failed', error, info.componentStack);
  }

  override render() {
    if (!this.state.error) return this.props.children;
    return (
      <div role="alert" className="rounded-xl border border-state-cutoff/60 bg-state-cutoff/10 p-6">
        <h1 className="text-lg font-bold">This page hit a problem</h1>
        <p className="mt-2 text-sm text-ink-muted">{this.state.error.message}</p>
        <button type="button" className="mt-4 min-h-11 rounded-lg border border-line px-4" onClick={() => this.setState({ error: null })}>
          Try again
        </button>
      </div>
    );
  }
}
