/** Whether a value reaches the specification: a decorative tick or cross, then the words. */
export function VerdictMark({ meets }: { meets: boolean }) {
  return meets ? (
    <span>
      <span aria-hidden="true">✓ </span>meets
    </span>
  ) : (
    <span className="text-caution-700">
      <span aria-hidden="true">✗ </span>falls short
    </span>
  );
}
