/** The cautions shown wherever a run starts. */
export function SafetyNotes() {
  return (
    <aside className="safety" aria-label="Before you start" data-testid="safety-notes">
      <h3>Before you start</h3>
      <ul>
        <li>
          The control-voltage and current limits are what protect the device under test: set them for its tuning port
          before any run.
        </li>
        <li>
          Long or overnight runs go on unattended — leave the bench in a state that is safe if something fails while
          nobody is there.
        </li>
        <li>
          Supplies and counters run from the mains: keep their cases earthed and covers on, and do not rework a live
          board.
        </li>
        <li>Local electrical codes and licensed practice take precedence over anything this program suggests.</li>
      </ul>
    </aside>
  );
}
