/** The short safety caution shown wherever revision results appear (same words as the README caution). */
export function ResultsCaution() {
  return (
    <p className="rounded-[3px] border border-caution/40 bg-caution-soft px-3 py-1.5 text-[12px] text-ink">
      <span className="font-semibold text-caution">
        <span aria-hidden="true">⚠ </span>Caution:
      </span>{' '}
      an engineering aid — results are only as good as the model. Designs must follow local codes and be checked under
      licensed practice; a lost neutral puts dangerous voltages on equipment.
    </p>
  );
}
