/** Query keys of the maintenance feature, from general to specific. */
export const maintenanceKeys = {
  all: ['maintenance'] as const,
  overview: () => [...maintenanceKeys.all, 'overview'] as const,
  plans: (toolId?: number) => [...maintenanceKeys.all, 'plans', toolId ?? null] as const,
  workOrders: () => [...maintenanceKeys.all, 'work-order'] as const,
  workOrder: (id: number) => [...maintenanceKeys.workOrders(), id] as const,
  parts: (filters: { toolId?: number; q?: string } = {}) => [...maintenanceKeys.all, 'parts', filters] as const,
  requal: (toolId: number) => [...maintenanceKeys.all, 'requal', toolId] as const,
  feeds: () => [...maintenanceKeys.all, 'feeds'] as const,
};
