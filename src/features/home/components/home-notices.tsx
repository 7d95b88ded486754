import { Link } from 'react-router';
import type { HomeResponse } from '@shared/schemas/home';
import { Alert } from '@/components/ui/alert';

export function HomeNotices({ notices }: { notices: HomeResponse['notices'] }) {
  if (notices.length === 0) return null;
  return (
    <section aria-label="Notices" className="space-y-2">
      {notices.map((n) => (
        <Alert key={n.key} tone={n.tone === 'warning' ? 'warning' : 'info'}>
          {n.message}
          {n.href && (
            <>
              {' '}
              <Link to={n.href} className="font-medium underline underline-offset-2">
                Open
              </Link>
            </>
          )}
        </Alert>
      ))}
    </section>
  );
}
