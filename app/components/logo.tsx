/** Thermotally's mark: a small energy profile (two wells and a barrier) stepping over a ledger rule. */
export function LogoMark({ size = 28 }: { size?: number }) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true">
      <rect x="1" y="1" width="30" height="30" rx="7" fill="#1f2430" />
      <path d="M5 22 H10 C13 22 13 9 16 9 C19 9 19 17 22 17 H27" fill="none" stroke="#e9874b" strokeWidth="2.4" strokeLinecap="round" />
      <path d="M5 26 H27" stroke="#8fb3c7" strokeWidth="1.4" strokeLinecap="round" />
    </svg>
  );
}

export function Wordmark() {
  return (
    <span className="inline-flex items-center gap-2 font-bold tracking-tight text-ink">
      <LogoMark />
      <span className="text-[17px]">Thermotally</span>
    </span>
  );
}
