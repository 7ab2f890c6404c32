import type { SVGProps } from 'react';

/** Gillwise's own line icons: 24×24, stroke-based, drawn for this product. */
const paths = {
  home: 'M3.5 11 12 4l8.5 7M6 9.5V20h4.5v-5.5h3V20H18V9.5',
  tasks: 'M9 6h11M9 12h11M9 18h11M3.5 6l1.5 1.5L7.5 5M3.5 12l1.5 1.5L7.5 11M3.5 18l1.5 1.5L7.5 17',
  tube: 'M9 3h6M10 3v12.5a2 2 0 0 0 4 0V3M10 10h4M6 21h12',
  moon: 'M19 14.5A7.5 7.5 0 0 1 9.5 5a7.5 7.5 0 1 0 9.5 9.5Z',
  drop: 'M12 3.5s-6 6.6-6 10.5a6 6 0 0 0 12 0c0-3.9-6-10.5-6-10.5ZM9.5 14.5a2.5 2.5 0 0 0 2.5 2.5',
  eye: 'M2.5 12S6 5.5 12 5.5 21.5 12 21.5 12 18 18.5 12 18.5 2.5 12 2.5 12ZM12 9.5a2.5 2.5 0 1 0 0 5 2.5 2.5 0 0 0 0-5Z',
  bell: 'M6 16.5V11a6 6 0 0 1 12 0v5.5l1.5 1.5h-15L6 16.5ZM10 20.5h4',
  map: 'M3.5 6.5 9 4l6 2.5L20.5 4v13.5L15 20l-6-2.5-5.5 2.5V6.5ZM9 4v13.5M15 6.5V20',
  report: 'M6 3.5h8.5L18.5 7.5V20.5H6V3.5ZM14 3.5V8h4.5M9 12h6M9 15.5h6',
  grid: 'M4 4h7v7H4zM13 4h7v7h-7zM4 13h7v7H4zM13 13h7v7h-7z',
  scoop: 'M3.5 10.5h17a8.5 8.5 0 0 1-17 0ZM8 7.5c0-1.5 1-2.5 2-3M12 7.5c0-1.5 1-2.5 2-3',
  fish: 'M2.5 12c2.5-4 6.5-5.5 10-5.5 3.5 0 6 2.5 7 5.5-1 3-3.5 5.5-7 5.5-3.5 0-7.5-1.5-10-5.5Zm0 0L0.5 8.5M2.5 12 0.5 15.5M15.5 10.5v.01',
  upload: 'M12 16V4.5M7.5 9 12 4.5 16.5 9M4.5 15v4.5h15V15',
  chart: 'M4 4v16h16M7.5 15l3.5-4 3 2.5 5-6.5',
  shield: 'M12 3.5 19 6v5.5c0 4.5-3 7.5-7 9-4-1.5-7-4.5-7-9V6l7-2.5ZM9 12l2 2 4-4',
  sliders: 'M5 4v6M5 14v6M12 4v3M12 11v9M19 4v9M19 17v3M3 10h4M10 7h4M17 13h4',
  people: 'M9 11a3.5 3.5 0 1 0 0-7 3.5 3.5 0 0 0 0 7ZM2.5 20c.5-3.5 3.2-5.5 6.5-5.5s6 2 6.5 5.5M16 4.5a3.5 3.5 0 0 1 0 6.5M18 14.5c2 .6 3.2 2.4 3.5 5',
  mail: 'M3.5 6h17v12h-17V6Zm0 0 8.5 7 8.5-7',
  more: 'M5 12h.01M12 12h.01M19 12h.01',
  signOut: 'M14 4.5H5.5v15H14M10 12h10.5M17 8.5l3.5 3.5-3.5 3.5',
  globe: 'M12 3.5a8.5 8.5 0 1 0 0 17 8.5 8.5 0 0 0 0-17ZM3.5 12h17M12 3.5c2.3 2.3 3.5 5.2 3.5 8.5s-1.2 6.2-3.5 8.5c-2.3-2.3-3.5-5.2-3.5-8.5s1.2-6.2 3.5-8.5Z',
  close: 'M6 6l12 12M18 6 6 18',
  info: 'M12 3.5a8.5 8.5 0 1 0 0 17 8.5 8.5 0 0 0 0-17ZM12 11v5.5M12 7.5v.01',
  caution: 'M12 3.5 21.5 20h-19L12 3.5ZM12 10v4.5M12 17.5v.01',
  check: 'M4.5 12.5 9.5 17.5 19.5 6.5',
  eyeOff: 'M3 3l18 18M10.6 6.1A9.7 9.7 0 0 1 12 6c6 0 9.5 6 9.5 6a17 17 0 0 1-3 3.6M6.6 7.6C4 9.3 2.5 12 2.5 12S6 18 12 18c1.6 0 3-.4 4.3-1M9.9 10a2.5 2.5 0 0 0 3.5 3.6',
  chevronDown: 'M6 9l6 6 6-6',
  arrowRight: 'M4.5 12h15M13.5 6l6 6-6 6',
} as const;

export type IconName = keyof typeof paths;

export interface IconProps extends Omit<SVGProps<SVGSVGElement>, 'name'> {
  name: IconName;
  size?: number;
  /** Give a label only when the icon stands alone and means something; otherwise it is hidden. */
  label?: string;
}

export function Icon({ name, size = 24, label, strokeWidth = 2, ...rest }: IconProps) {
  return (
    <svg
      width={size}
      height={size}
      viewBox="0 0 24 24"
      fill="none"
      stroke="currentColor"
      strokeWidth={strokeWidth}
      strokeLinecap="round"
      strokeLinejoin="round"
      role={label ? 'img' : undefined}
      aria-label={label}
      aria-hidden={label ? undefined : true}
      focusable="false"
      {...rest}
    >
      <path d={paths[name]} />
    </svg>
  );
}
