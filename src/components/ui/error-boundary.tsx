import { Component, Suspense, type ReactNode } from 'react';
import { QueryErrorResetBoundary } from '@tanstack/react-query';
import { isApiError } from '@/lib/api-client';
import { describeError } from '@/lib/errors';
import { Alert } from './alert';
import { Button } from './button';
import { LoadingBlock } from './spinner';

type FallbackProps = { error: unknown; reset: () => void };

type BoundaryProps = {
  children: ReactNode;
  fallback: (props: FallbackProps) => ReactNode;
  onReset?: () => void;
};

type BoundaryState = { error: unknown; failed: boolean };

export class ErrorBoundary extends Component<BoundaryProps, BoundaryState> {
  state: BoundaryState = { error: null, failed: false };

  static getDerivedStateFromError(error: unknown): BoundaryState {
    return { error, failed: true };
  }

  reset = (): void => {
    this.props.onReset?.();
    this.setState({ error: null, failed: false });
  };

  render(): ReactNode {
    if (this.state.failed) return this.props.fallback({ error: this.state.error, reset: this.reset });
    return this.props.children;
  }
}

export function RegionError({ error, reset, title = 'This part of the page could not be loaded' }: FallbackProps & { title?: string }) {
  const retryable = !isApiError(error) || error.status === 0 || error.status >= 500;
  return (
    <Alert tone="error" title={title}>
      <p>{describeError(error)}</p>
      {retryable ? (
        <Button variant="secondary" size="sm" className="mt-3" onClick={reset}>
          Try again
        </Button>
      ) : null}
    </Alert>
  );
}

/**
 * A region of a page that loads its own data: its own spinner, its own error with a retry,
 * so one failed request does not take the whole page down.
 */
export function QueryBoundary({
  children,
  loadingLabel,
  errorTitle,
  renderError,
}: {
  children: ReactNode;
  loadingLabel?: string;
  errorTitle?: string;
  renderError?: (props: FallbackProps) => ReactNode;
}) {
  return (
    <QueryErrorResetBoundary>
      {({ reset }) => (
        <ErrorBoundary
          onReset={reset}
          fallback={(props) => (renderError ? renderError(props) : <RegionError {...props} title={errorTitle} />)}
        >
          <Suspense fallback={<LoadingBlock label={loadingLabel} />}>{children}</Suspense>
        </ErrorBoundary>
      )}
    </QueryErrorResetBoundary>
  );
}
