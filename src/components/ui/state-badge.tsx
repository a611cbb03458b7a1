import type { ReactNode } from 'react';
import { BOARD_LABELS, BOARD_LOOK, type BoardStatus } from '@shared/equipment-state';
import { cx } from '@/lib/cx';

export type StateShapeName = (typeof BOARD_LOOK)[BoardStatus]['shape'];
export type StateBadgeSize = 'sm' | 'md' | 'lg' | 'xl';

// Shapes on a 16 × 16 grid, all of similar visual weight so that none looks "louder"
// except by its meaning.
const SHAPE_PATHS: Record<Exclude<StateShapeName, 'disc' | 'ring'>, string> = {
  triangle: 'M8 1.6 15.2 14.2H0.8Z',
  cross: 'M4.68 14.01 8 10.69 11.32 14.01 14.01 11.32 10.69 8 14.01 4.68 11.32 1.99 8 5.31 4.68 1.99 1.99 4.68 5.31 8 1.99 11.32Z',
  diamond: 'M8 0.8 15.2 8 8 15.2 0.8 8Z',
  hexagon: 'M15 8 11.5 14.06H4.5L1 8 4.5 1.94H11.5Z',
};

export interface StateShapeProps {
  shape: StateShapeName;
  /** CSS colour of the shape's body. */
  fill: string;
  /** CSS colour of an outline, for a body too light to reach 3:1 against its background. */
  stroke?: string;
  className?: string;
}

/** One state's shape as inline SVG; decorative, the word beside it carries the meaning. */
export function StateShape({ shape, fill, stroke, className }: StateShapeProps) {
  return (
    <svg viewBox="0 0 16 16" className={cx('shrink-0', className)} aria-hidden="true" focusable="false">
      {shape === 'disc' && <circle cx="8" cy="8" r="6.4" fill={fill} stroke={stroke ?? 'none'} strokeWidth="1" />}
      {shape === 'ring' && <circle cx="8" cy="8" r="5.4" fill="none" stroke={fill} strokeWidth="2.6" />}
      {shape !== 'disc' && shape !== 'ring' && (
        <path d={SHAPE_PATHS[shape]} fill={fill} stroke={stroke ?? 'none'} strokeWidth="1" strokeLinejoin="miter" />
      )}
    </svg>
  );
}

// Literal class names, so Tailwind finds them when it scans this file.
const TINT: Record<BoardStatus, string> = {
  running: 'bg-state-running-tint text-state-running-ink border-state-running-fill',
  limited: 'bg-state-limited-tint text-state-limited-ink border-state-limited-fill',
  down: 'bg-state-down-tint text-state-down-ink border-state-down-fill',
  maintenance: 'bg-state-maintenance-tint text-state-maintenance-ink border-state-maintenance-fill',
  engineering: 'bg-state-engineering-tint text-state-engineering-ink border-state-engineering-fill',
  offline: 'bg-state-offline-tint text-state-offline-ink border-state-offline-mark',
};

const SOLID: Record<BoardStatus, string> = {
  running: 'bg-state-running-fill text-state-running-on-fill border-state-running-fill',
  limited: 'bg-state-limited-fill text-state-limited-on-fill border-state-limited-ink',
  down: 'bg-state-down-fill text-state-down-on-fill border-state-down-fill',
  maintenance: 'bg-state-maintenance-fill text-state-maintenance-on-fill border-state-maintenance-fill',
  engineering: 'bg-state-engineering-fill text-state-engineering-on-fill border-state-engineering-fill',
  offline: 'bg-state-offline-fill text-state-offline-on-fill border-state-offline-mark',
};

// Amber on its light tint reaches only 1.74:1, so the Limited triangle gets an ink outline;
// the other marks reach 4.29:1 or more on their tints by themselves (see styles/index.css).
const OUTLINED_ON_TINT: ReadonlySet<BoardStatus> = new Set(['limited']);

const SIZES: Record<StateBadgeSize, { box: string; shape: string }> = {
  sm: { box: 'h-6 gap-1 px-2 text-xs font-semibold rounded-md', shape: 'size-3.5' },
  md: { box: 'h-8 gap-1.5 px-2.5 text-sm font-semibold rounded-md', shape: 'size-4' },
  lg: { box: 'h-10 gap-2 px-3 text-base font-semibold rounded-lg', shape: 'size-5' },
  xl: { box: 'h-16 gap-3 px-5 text-3xl font-bold rounded-xl', shape: 'size-9' },
};

export interface StateBadgeProps {
  status: BoardStatus;
  /** sm for dense tables, md by default, lg for cards, xl for the lobby display. */
  size?: StateBadgeSize;
  /** `tint` (light background, dark text) by default; `solid` for dark or busy backgrounds. */
  variant?: 'tint' | 'solid';
  /** Replaces the state word, e.g. "Down (reported)". Keep the state word in it. */
  label?: ReactNode;
  className?: string;
}

/**
 * A board status told three ways — colour, shape and word — so it reads for colour-blind
 * people and in the amber room, where the colours are switched off entirely.
 */
export function StateBadge({ status, size = 'md', variant = 'tint', label, className }: StateBadgeProps) {
  const look = BOARD_LOOK[status];
  const sizing = SIZES[size];
  const solid = variant === 'solid';
  return (
    <span
      data-status={status}
      className={cx(
        'state-badge inline-flex shrink-0 items-center border leading-none whitespace-nowrap',
        solid ? SOLID[status] : TINT[status],
        sizing.box,
        className,
      )}
    >
      <StateShape
        shape={look.shape}
        fill={solid ? `var(--color-state-${status}-on-fill)` : `var(--color-state-${status}-mark)`}
        stroke={!solid && OUTLINED_ON_TINT.has(status) ? `var(--color-state-${status}-ink)` : undefined}
        className={sizing.shape}
      />
      <span>{label ?? BOARD_LABELS[status]}</span>
    </span>
  );
}
