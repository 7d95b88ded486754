import { cx } from '@/lib/cx';

export type CautionTopic = 'repair' | 'readings';

/**
 * The usual cautions of the trade, shown where repairs and readings are entered. They remind;
 * they do not replace the manufacturer's service procedures, local codes or licensed practice.
 */
export function SafetyCautions({ topic, gas, className }: { topic: CautionTopic; gas: boolean; className?: string }) {
  const items =
    topic === 'repair'
      ? [
          'Disconnect and lock out electrical power (and close the gas supply) before opening panels or touching wiring, as in lockout/tagout practice (OSHA 29 CFR 1910.147).',
          'Let hot oil, platens, grill plates and cabinet walls cool before handling them; drain or cover oil before work on a fryer.',
          ...(gas ? ['After any work on gas connections, check every joint for leaks with a leak-detection solution or a gas detector, never with an open flame (NFPA 54).'] : []),
          'Raise, tilt or move heavy equipment with help or a lift, lock the casters and refit the restraints afterwards.',
        ]
      : [
          'Take voltage and current readings on live circuits only if you are qualified to, with a meter rated for the circuit; lock out power again before touching components.',
          'Temperature readings mean hot surfaces and hot oil: use a probe holder or gloves, and keep clear of splashing oil.',
          ...(gas ? ['Where readings follow gas work, check the connections for leaks first, never with an open flame (NFPA 54).'] : []),
        ];
  return (
    <section aria-label={topic === 'repair' ? 'Safety before service' : 'Safety while taking readings'} className={cx('rounded-md border border-orange-300 bg-orange-50 px-3 py-2 text-sm text-orange-950', className)}>
      <p className="flex items-center gap-2 font-semibold">
        <svg aria-hidden="true" viewBox="0 0 20 20" className="size-4 shrink-0" fill="currentColor">
          <path d="M10 2 1 18h18L10 2Zm0 5 .9 6h-1.8L10 7Zm0 8.2a1.1 1.1 0 1 1 0 2.2 1.1 1.1 0 0 1 0-2.2Z" />
        </svg>
        {topic === 'repair' ? 'Before you service the unit' : 'While you take readings'}
      </p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        {items.map((t) => (
          <li key={t}>{t}</li>
        ))}
      </ul>
      <p className="mt-1 text-xs">Follow the manufacturer’s service procedures, local codes and licensed practice; these notes do not replace them.</p>
    </section>
  );
}
