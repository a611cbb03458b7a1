/** Query keys of the facility admin pages, from general to specific. */
export const adminKeys = {
  all: ['facility-admin'] as const,
  areas: (includeRetired: boolean) => [...adminKeys.all, 'areas', { includeRetired }] as const,
  toolLists: () => [...adminKeys.all, 'tools'] as const,
  toolList: (filters: { q: string; areaId: number | null; includeRetired: boolean; offset: number }) =>
    [...adminKeys.toolLists(), filters] as const,
  tool: (id: number) => [...adminKeys.all, 'tool', id] as const,
  engineers: () => [...adminKeys.all, 'engineers'] as const,
  displayLinks: (includeRevoked: boolean) => [...adminKeys.all, 'display-links', { includeRevoked }] as const,
};

export interface AdminArea {
  id: number;
  name: string;
  code: string;
  description: string | null;
  sortOrder: number;
  retiredAt: string | null;
}

export interface AdminModule {
  id: number;
  toolId: number;
  name: string;
  code: string;
  sortOrder: number;
  retiredAt: string | null;
}

export interface AdminTool {
  id: number;
  code: string;
  name: string;
  areaId: number;
  description: string | null;
  criticality: 'high' | 'normal' | 'low';
  primaryEngineerId: number | null;
  backupEngineerId: number | null;
  retiredAt: string | null;
  version: number;
}

export interface AdminToolRow extends AdminTool {
  area: { id: number; name: string; code: string } | null;
  primaryEngineer: { id: number; name: string } | null;
  backupEngineer: { id: number; name: string } | null;
  moduleCount: number;
}

export interface AdminToolDetail extends AdminTool {
  modules: AdminModule[];
}

export interface Engineer {
  id: number;
  name: string;
  email: string;
  role: string;
}
