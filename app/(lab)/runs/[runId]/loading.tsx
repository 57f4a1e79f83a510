/** First paint while the run's analysis and plot series load: the page's shape, no numbers. */
export default function RunLoading() {
  return (
    <div aria-busy="true" aria-label="Loading the run" className="space-y-6">
      <div className="h-9 w-72 animate-pulse rounded bg-rule" />
      {[180, 120, 360, 200].map((h, i) => (
        <div key={i} className="animate-pulse rounded-lg border border-rule bg-sheet p-5" style={{ height: h }}>
          <div className="h-4 w-40 rounded bg-rule" />
        </div>
      ))}
    </div>
  );
}
