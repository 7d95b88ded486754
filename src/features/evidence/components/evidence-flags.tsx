import { evidenceFlagLabels, type EvidenceFlagView } from '@shared/schemas/evidence';
import { Badge } from '@/components/ui/badge';

/** The evidence checks that found something, each with its reason. */
export function EvidenceFlags({ flags, title = 'Evidence checks' }: { flags: EvidenceFlagView[]; title?: string }) {
  if (flags.length === 0) return null;
  return (
    <section aria-label={title} className="rounded-md border border-brass-300 bg-brass-50 px-3 py-2">
      <h3 className="text-sm font-semibold text-ink-900">{title}</h3>
      <ul className="mt-1 space-y-1 text-sm">
        {flags.map((f, i) => (
          <li key={`${f.code}-${f.attachmentId ?? f.readingKey ?? i}`} className="flex flex-wrap items-start gap-2">
            <Badge tone="brass">{evidenceFlagLabels[f.code] ?? f.code}</Badge>
            <span className="min-w-0 flex-1 text-ink-800">{f.message}</span>
          </li>
        ))}
      </ul>
    </section>
  );
}
