/** The Loopwright mark: an amplifier with its feedback loop, and the word. */
export function Mark({ size = 24 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" fill="none" aria-hidden="true">
      <rect x="1" y="1" width="30" height="30" rx="7" fill="#24272b" />
      <path d="M9 9.5v13l11-6.5z" fill="#f5f2ea" />
      <path d="M20 16h4v-9H12.5v3.2" stroke="#d27a45" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" />
      <circle cx="12.5" cy="11.6" r="1.3" fill="#d27a45" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2">
      <Mark />
      <span className="text-[15px] font-semibold tracking-[-0.01em]">Loopwright</span>
    </span>
  );
}
