export function BrandMark({ className = 'size-7' }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" aria-hidden="true" className={className}>
      <rect width="32" height="32" rx="7" className="fill-ink-700" />
      <path
        d="M8 23c4-9 12-9 16-14"
        fill="none"
        className="stroke-accent-bright"
        strokeWidth="2.5"
        strokeLinecap="round"
        strokeDasharray="1 4.2"
      />
      <circle cx="8" cy="23" r="3" className="fill-surface-page" />
      <circle cx="24" cy="9" r="3" className="fill-accent-bright" />
    </svg>
  );
}
