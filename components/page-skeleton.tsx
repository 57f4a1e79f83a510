/** First paint while a notebook page loads its figures: the page's shape, no numbers. */
export function PageSkeleton({ label, panels }: { label: string; panels: number[] }) {
  return (
    <div aria-busy="true" aria-label={label} className="space-y-6">
      <div className="h-9 w-72 animate-pulse rounded bg-rule" />
      {panels.map((height, i) => (
        <div key={i} className="animate-pulse rounded-lg border border-rule bg-sheet p-5" style={{ height }}>
          <div className="h-4 w-40 rounded bg-rule" />
        </div>
      ))}
    </div>
  );
}
