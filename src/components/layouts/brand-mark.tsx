/** Fieldproof's mark: a check set in a rounded plate, drawn here (no external asset). */
export function BrandMark({ className }: { className?: string }) {
  return (
    <svg aria-hidden="true" viewBox="0 0 32 32" className={className}>
      <rect x="2" y="2" width="28" height="28" rx="7" fill="#1a4c48" />
      <path d="M9 16.5l4.5 4.5L23 11" fill="none" stroke="#dfb354" strokeWidth="3.2" strokeLinecap="round" strokeLinejoin="round" />
    </svg>
  );
}
