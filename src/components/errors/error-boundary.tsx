import { Component, type ErrorInfo, type ReactNode } from 'react';

interface Props {
  /** Rendered instead of the children after an error; `reset` tries the children again. */
  fallback: (props: { error: unknown; reset: () => void }) => ReactNode;
  children: ReactNode;
}

/**
 * Catches render errors below it. Put one around any panel that can fail on its own
 * (a map, a side list) so the rest of the page keeps working.
 */
export class ErrorBoundary extends Component<Props, { error: unknown; failed: boolean }> {
  state = { error: null as unknown, failed: false };

  static getDerivedStateFromError(error: unknown) {
    return { error, failed: true };
  }

  componentDidCatch(error: unknown, info: ErrorInfo) {
    console.error(error, info.componentStack);
  }

  reset = () => this.setState({ error: null, failed: false });

  render() {
    if (this.state.failed) return this.props.fallback({ error: this.state.error, reset: this.reset });
    return this.props.children;
  }
}
