export function SiteFooter() {
  return (
    <footer className="border-t border-foil-800/80">
      <div className="mx-auto flex max-w-6xl flex-col gap-2 px-4 py-6 text-sm text-foil-500 sm:flex-row sm:justify-between sm:px-6">
        <p>Lightkeel — pledges, dispatches, orbit analysis and books for small solar-sail missions.</p>
        <p>The Saltmarsh Orbital Society and Tern-1 are a fictional demonstration.</p>
      </div>
    </footer>
  );
}
