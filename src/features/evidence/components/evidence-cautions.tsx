/**
 * The usual cautions where photos are taken and readings entered at the unit. They remind; the
 * manufacturer's service procedures, local codes and licensed practice come first.
 */
export function EvidenceCautions({ gas }: { gas: boolean }) {
  return (
    <section aria-label="Safety while taking photos and readings" className="rounded-md border border-orange-300 bg-orange-50 px-3 py-2 text-sm text-orange-950">
      <p className="font-semibold">Safety at the unit</p>
      <ul className="mt-1 list-disc space-y-0.5 pl-5">
        <li>Lock out and tag out electrical power (and close the gas) before reaching inside a panel for a photo of a part (OSHA 29 CFR 1910.147).</li>
        <li>Keep clear of hot oil, platens and cabinet walls; wait until they cool before moving or opening the unit.</li>
        {gas && <li>After gas work, leak-check every joint with a leak-detection solution or a detector, never with an open flame (NFPA 54).</li>}
        <li>Photograph a serial plate under heavy equipment only once the unit is raised and blocked safely, with help or a lift.</li>
      </ul>
      <p className="mt-1 text-xs">Follow the manufacturer’s service procedures and local codes first.</p>
    </section>
  );
}
