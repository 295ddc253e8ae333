// Beadpath's own line icons, drawn for the project (inline SVG, currentColor).
import type { SVGProps } from 'react';

function Svg(props: SVGProps<SVGSVGElement>) {
  return <svg viewBox="0 0 24 24" width="20" height="20" fill="none" stroke="currentColor" strokeWidth="2" strokeLinecap="round" strokeLinejoin="round" aria-hidden {...props} />;
}

export const Icon = {
  home: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M4 11l8-7 8 7v9h-5v-6H9v6H4z" />
    </Svg>
  ),
  calculator: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <rect x="5" y="3" width="14" height="18" rx="2" />
      <path d="M8 7h8M8 12h2M14 12h2M8 16h2M14 16h2" />
    </Svg>
  ),
  users: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <circle cx="9" cy="8" r="3.5" />
      <path d="M2.5 20c.8-3.6 3.3-5.5 6.5-5.5s5.7 1.9 6.5 5.5M16 4.8a3.5 3.5 0 010 6.4M18.5 14.8c1.6.8 2.6 2.5 3 5.2" />
    </Svg>
  ),
  account: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <circle cx="12" cy="8" r="4" />
      <path d="M4 21c1-4 4-6 8-6s7 2 8 6" />
    </Svg>
  ),
  guide: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <circle cx="6" cy="5" r="2" />
      <circle cx="6" cy="19" r="2" />
      <circle cx="18" cy="12" r="2" />
      <path d="M6 7v10M8 5c6 0 8 3 8 5M8 19c6 0 8-3 8-5" />
    </Svg>
  ),
  /** A dispensing valve: body, needle and a dot below the nozzle. */
  valve: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <rect x="7" y="3" width="10" height="11" rx="2" />
      <path d="M12 14v4M10 18h4" />
      <circle cx="12" cy="21" r="1" fill="currentColor" />
    </Svg>
  ),
  chart: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M4 20V4M4 20h16" />
      <path d="M8 16v-5M12 16V8M16 16v-3" />
    </Svg>
  ),
  phone: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M5 4h4l2 5-2.5 1.5a11 11 0 005 5L15 13l5 2v4a2 2 0 01-2 2A16 16 0 013 6a2 2 0 012-2z" />
    </Svg>
  ),
  mail: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <rect x="3" y="5" width="18" height="14" rx="2" />
      <path d="M3 7l9 6 9-6" />
    </Svg>
  ),
  search: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <circle cx="11" cy="11" r="6" />
      <path d="M20 20l-4.5-4.5" />
    </Svg>
  ),
  book: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M4 5a2 2 0 012-2h13v16H6a2 2 0 00-2 2z" />
      <path d="M4 19V5M8 7h7M8 11h5" />
    </Svg>
  ),
  settings: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <circle cx="12" cy="12" r="3" />
      <path d="M12 2v3M12 19v3M2 12h3M19 12h3M4.9 4.9l2.1 2.1M17 17l2.1 2.1M4.9 19.1L7 17M17 7l2.1-2.1" />
    </Svg>
  ),
  menu: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M4 7h16M4 12h16M4 17h16" />
    </Svg>
  ),
  close: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M6 6l12 12M18 6L6 18" />
    </Svg>
  ),
  /** A gauge: readings and Measure steps. */
  gauge: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M4 17a8 8 0 1116 0" />
      <path d="M12 17l4-5" />
      <circle cx="12" cy="17" r="1.2" fill="currentColor" />
    </Svg>
  ),
  warning: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M12 3l10 18H2z" />
      <path d="M12 10v5M12 18v.5" />
    </Svg>
  ),
  copy: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <rect x="8" y="8" width="12" height="12" rx="2" />
      <path d="M16 8V5a1 1 0 00-1-1H5a1 1 0 00-1 1v10a1 1 0 001 1h3" />
    </Svg>
  ),
  link: (p: SVGProps<SVGSVGElement>) => (
    <Svg {...p}>
      <path d="M10 14a4 4 0 005.7 0l3-3a4 4 0 00-5.7-5.7l-1 1M14 10a4 4 0 00-5.7 0l-3 3a4 4 0 005.7 5.7l1-1" />
    </Svg>
  ),
};

export function Wordmark({ className = '' }: { className?: string }) {
  return (
    <span className={`inline-flex items-center gap-2 font-serif text-xl font-semibold ${className}`}>
      <svg viewBox="0 0 32 32" width="28" height="28" aria-hidden>
        <path d="M4 21c4 0 4-6 8-6s4 6 8 6 4-6 8-6" fill="none" stroke="#9C5700" strokeWidth="3" strokeLinecap="round" />
        <circle cx="8" cy="9" r="3" fill="currentColor" />
      </svg>
      Beadpath
    </span>
  );
}
