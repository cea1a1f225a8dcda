import { Component, type ErrorInfo, type ReactNode } from 'react';
import { markDrawFailed } from './draw-health.ts';

interface Props {
  /** What this part of the page is, in plain words ("the plot", "the peak table"). */
  area: string;
  children: ReactNode;
  /** True for the part that draws the main plot: its failure is remembered across a reload. */
  drawsSession?: boolean;
  /** Extra controls in the message (for example: start without the saved session). */
  actions?: ReactNode;
}

interface State {
  error: Error | null;
}

/**
 * Keeps a fault in one part of the page inside that part: the part shows
 * what failed and a way to try again, and everything else stays usable.
 * Before these boundaries, one exception while drawing unmounted the whole
 * interface and left a blank page.
 */
export class ErrorBoundary extends Component<Props, State> {
  override state: State = { error: null };

  static getDerivedStateFromError(error: Error): State {
    return { error };
  }

  override componentDidCatch(error: Error, info: ErrorInfo): void {
    if (this.props.drawsSession) markDrawFailed(`${this.props.area}: ${error.message}`);
    // Kept in the console for a bug report; the page itself says what failed.
    console.warn(`Tracewright: ${this.props.area} failed`, error, info.componentStack);
  }

  override render(): ReactNode {
    const { error } = this.state;
    if (!error) return this.props.children;
    return (
      <div className="panel part-failed" role="alert" data-testid="part-failed">
        <h2>{capitalise(this.props.area)} stopped with an error</h2>
        <p>“{error.message || error.name}”. Your data and the rest of the page are unaffected.</p>
        <div className="row">
          <button type="button" onClick={() => this.setState({ error: null })}>Try again</button>
          {this.props.actions}
        </div>
      </div>
    );
  }
}

function capitalise(s: string): string {
  return s ? s[0].toUpperCase() + s.slice(1) : s;
}
