interface BrandMarkProps {
  size: number;
}

/** Railwright's mark: two rails crossed by two test probes, in graphite and copper. */
export function BrandMark({ size }: BrandMarkProps) {
  return (
    <svg width={size} height={size} viewBox="0 0 32 32" aria-hidden="true" focusable="false">
      <rect width="32" height="32" rx="6" fill="var(--mantine-color-graphite-8)" />
      <path d="M6 22h20M6 10h20" stroke="var(--mantine-color-copper-5)" strokeWidth="3" strokeLinecap="round" />
      <path d="M11 10v12M21 10v12" stroke="var(--mantine-color-graphite-1)" strokeWidth="2.5" strokeLinecap="round" />
    </svg>
  );
}
