/**
 * The usual cautions for lithium cell testing, shown where tests are set up and where results
 * show unsafe conditions. Kneepoint records; it does not protect. Wording is our own.
 */
export function SafetyCautions({ compact = false }: { compact?: boolean }) {
  return (
    <aside aria-label="Safety cautions" className="rounded-lg border-l-4 border-warn bg-warn-wash px-4 py-3 text-sm text-ink">
      <p className="font-semibold text-warn">Lithium cells can vent, burn or explode</p>
      {compact ? (
        <p className="mt-1">
          Stop the test and keep clear of a cell that is swollen, hot, leaking or smells of solvent. The cell maker&apos;s data sheet, your local codes and your lab&apos;s
          procedures come first.
        </p>
      ) : (
        <ul className="mt-2 list-disc space-y-1 pl-5">
          <li>Never leave a charge unattended; test on a non-combustible surface away from anything that burns.</li>
          <li>Set the supply&apos;s voltage and current limits and the load&apos;s cut-off from the cell maker&apos;s data sheet before connecting the cell.</li>
          <li>Stop using any cell that is swollen, hot, leaking or smells of solvent; keep cells in fire-resistant containers.</li>
          <li>Burning cells release toxic gases, hydrogen fluoride among them: evacuate and call the emergency services if a cell smokes.</li>
          <li>Kneepoint&apos;s checks are a record, not a protection device. Local codes, the data sheet and your lab&apos;s procedures always come first.</li>
        </ul>
      )}
    </aside>
  );
}
