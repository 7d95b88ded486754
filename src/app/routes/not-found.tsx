import { Link, useLocation } from 'react-router';
import { paths } from '@/config/paths';
import { buttonClass } from '@/components/ui/button';

export function NotFoundRoute() {
  const location = useLocation();
  return (
    <div className="mx-auto max-w-lg py-12 text-center">
      <title>Page not found · Fieldproof</title>
      <p className="font-mono text-sm text-ink-500">404</p>
      <h1 className="mt-2 text-2xl font-semibold text-ink-900">Page not found</h1>
      <p className="mt-2 text-ink-700">
        Nothing lives at <span className="break-all font-mono text-sm">{location.pathname}</span>. The link may be old or mistyped.
      </p>
      <div className="mt-6 flex justify-center gap-3">
        <Link to={paths.home} className={buttonClass('primary')}>
          Go to home
        </Link>
        <Link to={paths.claims} className={buttonClass('secondary')}>
          Claims
        </Link>
      </div>
    </div>
  );
}
