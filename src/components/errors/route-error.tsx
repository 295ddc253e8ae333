// The page-level error boundary and the not-found page.
import { isRouteErrorResponse, Link, useRouteError } from 'react-router';
import { ApiError } from '@/lib/api-client';
import { buttonClass } from '@/components/ui/button';

export function NotFoundPage() {
  return (
    <div className="mx-auto max-w-lg py-12 text-center">
      <p className="font-serif text-5xl font-semibold text-amber">404</p>
      <h1 className="mt-2 text-2xl font-semibold">This page is not in the notebook</h1>
      <p className="mt-2 text-ink-soft">The address may be mistyped, or the page was moved or retired.</p>
      <Link to="/" className={buttonClass('primary', 'mt-6')}>
        Go to your home page
      </Link>
    </div>
  );
}

export function RouteError() {
  const err = useRouteError();
  if (isRouteErrorResponse(err) && err.status === 404) return <NotFoundPage />;
  const forbidden = err instanceof ApiError && err.status === 403;
  return (
    <div className="mx-auto max-w-lg py-12 text-center" role="alert">
      <h1 className="text-2xl font-semibold">{forbidden ? 'Your roles do not open this page' : 'This page could not be shown'}</h1>
      <p className="mt-2 text-ink-soft">{forbidden ? 'Ask an admin if you need access.' : err instanceof Error ? err.message : 'An unexpected problem stopped this page. Reload to try again.'}</p>
      <div className="mt-6 flex justify-center gap-2">
        <button type="button" className={buttonClass('secondary')} onClick={() => window.location.reload()}>
          Reload
        </button>
        <Link to="/" className={buttonClass('primary')}>
          Home
        </Link>
      </div>
    </div>
  );
}

export function Forbidden() {
  return (
    <div className="mx-auto max-w-lg py-12 text-center" role="alert">
      <h1 className="text-2xl font-semibold">Your roles do not open this page</h1>
      <p className="mt-2 text-ink-soft">Ask an admin if you need access.</p>
      <Link to="/" className={buttonClass('primary', 'mt-6')}>
        Home
      </Link>
    </div>
  );
}
