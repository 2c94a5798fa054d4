import type { SVGProps } from "react";

// Small stroke icons drawn for Tidemark. Decorative by default: the word beside
// each icon carries the meaning for assistive technology.
type IconProps = SVGProps<SVGSVGElement> & { title?: string };

function Svg({ title, children, ...rest }: IconProps) {
  return (
    <svg
      viewBox="0 0 20 20"
      width="1em"
      height="1em"
      fill="none"
      stroke="currentColor"
      strokeWidth={1.7}
      strokeLinecap="round"
      strokeLinejoin="round"
      aria-hidden={title ? undefined : true}
      role={title ? "img" : undefined}
      {...rest}
    >
      {title ? <title>{title}</title> : null}
      {children}
    </svg>
  );
}

/** In band: a level line between two marks. */
export const IconInBand = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 5h14M3 15h14" opacity={0.55} />
    <path d="M4 10h12" />
  </Svg>
);
/** Below band: a chevron falling under a line. */
export const IconBelow = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 6h14" opacity={0.55} />
    <path d="M6 10l4 5 4-5" />
  </Svg>
);
/** Above band: a chevron rising over a line. */
export const IconAbove = (p: IconProps) => (
  <Svg {...p}>
    <path d="M3 14h14" opacity={0.55} />
    <path d="M6 10l4-5 4 5" />
  </Svg>
);
/** Overdue: an hourglass. */
export const IconOverdue = (p: IconProps) => (
  <Svg {...p}>
    <path d="M6 3h8M6 17h8M7 3c0 4 6 4 6 7s-6 3-6 7M13 3c0 4-6 4-6 7s6 3 6 7" />
  </Svg>
);
/** Escalated: stacked upward chevrons. */
export const IconEscalated = (p: IconProps) => (
  <Svg {...p}>
    <path d="M5 11l5-5 5 5M5 16l5-5 5 5" />
  </Svg>
);
export const IconInfo = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="10" cy="10" r="7.5" />
    <path d="M10 9v5M10 6.2v.1" />
  </Svg>
);
export const IconCheck = (p: IconProps) => (
  <Svg {...p}>
    <path d="M4 10.5l4 4 8-9" />
  </Svg>
);
export const IconWarning = (p: IconProps) => (
  <Svg {...p}>
    <path d="M10 3l8 14H2z" />
    <path d="M10 8v4M10 14.5v.1" />
  </Svg>
);
export const IconSun = (p: IconProps) => (
  <Svg {...p}>
    <circle cx="10" cy="10" r="3.5" />
    <path d="M10 2v2M10 16v2M2 10h2M16 10h2M4.3 4.3l1.4 1.4M14.3 14.3l1.4 1.4M4.3 15.7l1.4-1.4M14.3 5.7l1.4-1.4" />
  </Svg>
);
export const IconMoon = (p: IconProps) => (
  <Svg {...p}>
    <path d="M15.5 12.5A6.5 6.5 0 0 1 7.5 4.5a6.5 6.5 0 1 0 8 8z" />
  </Svg>
);
export const IconMonitor = (p: IconProps) => (
  <Svg {...p}>
    <rect x="2.5" y="3.5" width="15" height="10" rx="1.5" />
    <path d="M7 17h6M10 13.5V17" />
  </Svg>
);
export const IconChevronDown = (p: IconProps) => (
  <Svg {...p}>
    <path d="M5 8l5 5 5-5" />
  </Svg>
);
export const IconSort = ({
  direction,
  ...p
}: IconProps & { direction: "asc" | "desc" | "none" }) => (
  <Svg {...p}>
    <path d="M7 8l3-3 3 3" opacity={direction === "desc" ? 0.25 : 1} />
    <path d="M7 12l3 3 3-3" opacity={direction === "asc" ? 0.25 : 1} />
  </Svg>
);
/** The Tidemark mark: a tide line crossing a level mark. */
export const IconMark = (p: IconProps) => (
  <Svg {...p}>
    <path d="M2 12c2.5-3 5-3 8 0s5.5 3 8 0" />
    <path d="M10 3v14" opacity={0.6} />
    <path d="M7.5 5.5h5" />
  </Svg>
);
