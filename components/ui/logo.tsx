/** Tallyvat's mark: a vat with a tally of three strokes. */
export function Logo({ className = '' }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-bold tracking-tight ${className}`}>
      <svg viewBox="0 0 32 32" width="28" height="28" aria-hidden="true">
        <rect x="4" y="6" width="24" height="22" rx="5" fill="#f59f24" />
        <rect x="4" y="6" width="24" height="7" rx="3" fill="#fbbb4d" />
        <path d="M11 16v8M16 16v8M21 16v8" stroke="#1d3f33" strokeWidth="2.5" strokeLinecap="round" />
      </svg>
      <span>Tallyvat</span>
    </span>
  );
}
