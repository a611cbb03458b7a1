import { matchesSearch } from '@shared/search';
import { useCallback, useEffect, useRef, useState } from 'react';
import { useSearchParams } from 'react-router';
import { BOARD_STATUSES, type BoardStatus } from '@shared/equipment-state';
import type { BoardArea, BoardData, BoardTool } from '@shared/schemas/facility';

export interface BoardFilters {
  q: string;
  areaId: number | null;
  status: BoardStatus | null;
}

function parse(params: URLSearchParams): BoardFilters {
  const area = Number(params.get('area'));
  const status = params.get('status');
  return {
    q: params.get('q') ?? '',
    areaId: Number.isInteger(area) && area > 0 ? area : null,
    status: status && (BOARD_STATUSES as readonly string[]).includes(status) ? (status as BoardStatus) : null,
  };
}

function toParams(f: BoardFilters): URLSearchParams {
  const p = new URLSearchParams();
  if (f.q) p.set('q', f.q);
  if (f.areaId) p.set('area', String(f.areaId));
  if (f.status) p.set('status', f.status);
  return p;
}

/**
 * Filters live in the address, so a filtered board can be bookmarked or shared. The screen
 * follows local state, because the address catches up a moment later (each change is a
 * navigation); a change of address that did not come from here (a link to the plain board,
 * the back button) replaces the filters.
 */
export function useBoardFilters() {
  const [params, setParams] = useSearchParams();
  const [filters, setState] = useState<BoardFilters>(() => parse(params));
  const latest = useRef(filters);
  const ours = useRef(new Set<string>());
  const key = params.toString();

  useEffect(() => {
    if (ours.current.has(key)) {
      if (key === toParams(latest.current).toString()) ours.current.clear();
      return;
    }
    const outside = parse(new URLSearchParams(key));
    latest.current = outside;
    setState(outside);
  }, [key]);

  const setFilters = useCallback(
    (next: Partial<BoardFilters>) => {
      const merged = { ...latest.current, ...next };
      latest.current = merged;
      setState(merged);
      const p = toParams(merged);
      ours.current.add(p.toString());
      setParams(p, { replace: true });
    },
    [setParams],
  );

  return { filters, setFilters };
}

function matches(tool: BoardTool, areaName: string, filters: BoardFilters): boolean {
  if (filters.status && tool.status !== filters.status) return false;
  if (filters.areaId && tool.areaId !== filters.areaId) return false;
  return matchesSearch(filters.q, [tool.code, tool.name, areaName]);
}

/** The board's areas with only the tools that pass the filters; empty areas are dropped. */
export function filterBoard(data: BoardData, filters: BoardFilters): BoardArea[] {
  return data.areas
    .map((area) => ({ ...area, tools: area.tools.filter((t) => matches(t, area.name, filters)) }))
    .filter((area) => area.tools.length > 0);
}
