import { apiErrorMessage } from '@/lib/api-client';
import { Alert } from './alert';

/** The server's own message for a failed request, announced to screen readers. */
export function FormError({
  error,
  fallback,
  className,
}: {
  error: unknown;
  fallback: string;
  className?: string;
}) {
  const message = apiErrorMessage(error, fallback);
  return (
    <div aria-live="assertive">
      {message && (
        <Alert tone="danger" className={className}>
          {message}
        </Alert>
      )}
    </div>
  );
}
