/** The safety caution every signed-in page carries (same words as the README caution). */
export function SafetyNote() {
  return (
    <aside aria-label="Safety caution" className="border-t border-rule bg-sunken/60 px-6 py-2.5 text-[12px] text-ink-muted">
      <span className="mr-1 font-semibold text-caution">
        <span aria-hidden="true">⚠ </span>Caution:
      </span>
      Wyeward is an engineering aid, and its results are only as good as the model behind them. Designs must
      follow local codes and be checked under licensed practice. A lost neutral puts dangerous voltages on
      equipment and people.
    </aside>
  );
}
