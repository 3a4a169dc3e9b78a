/** The cautions PRODUCT.md requires wherever a user dispatches or releases a robot. */
export function SafetyCaution() {
  return (
    <div role="note" aria-label="Safety caution" className="rounded-md border border-amberline/50 bg-amberline/10 p-3 text-sm text-ink-100">
      <p className="font-semibold text-amberline">Moving robots can hurt people and damage property.</p>
      <ul className="mt-1.5 list-disc space-y-0.5 pl-5 text-ink-300">
        <li>Keep people clear of robot paths.</li>
        <li>Keep a physical emergency stop within reach.</li>
        <li>The software hold is not a safety-rated stop.</li>
        <li>Follow the site&apos;s machinery safety rules and local codes (for industrial mobile robots, the applicable national and international safety standards).</li>
        <li>A competent person must sign off on the site before robots run unattended.</li>
      </ul>
    </div>
  );
}
