/** Peeksafe's mark (same drawing as public/logo.svg) with the word beside it. */
export function Logo({ withWord = true }: { withWord?: boolean }) {
  return (
    <span className="inline-flex items-center gap-2">
      <svg viewBox="0 0 32 32" className="h-7 w-7 shrink-0" aria-hidden="true">
        <rect width="32" height="32" rx="8" fill="#285244" />
        <path d="M6 21c3-8 7-12 10-12s7 4 10 12" fill="none" stroke="#dcebe3" strokeWidth="2.4" strokeLinecap="round" />
        <circle cx="16" cy="18" r="3.4" fill="#dcebe3" />
        <path d="M6 24h20" stroke="#8cbaa6" strokeWidth="1.6" strokeLinecap="round" strokeDasharray="2 3" />
      </svg>
      {withWord ? <span className="text-base font-semibold tracking-tight text-tremor-content-strong dark:text-dark-tremor-content-strong">Peeksafe</span> : <span className="sr-only">Peeksafe</span>}
    </span>
  );
}
