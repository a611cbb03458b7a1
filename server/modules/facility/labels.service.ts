import QRCode from 'qrcode';
import { Area, Tool } from './facility.model';
import type { AppDeps } from '../../lib/http';
import type { ToolLabel } from '../../../shared/schemas/facility';

/** The address a tool's label opens: the tool page, where "Report a fault" is one tap away. */
export function toolUrl(publicUrl: string, code: string) {
  return `${publicUrl.replace(/\/$/, '')}/tools/${encodeURIComponent(code)}`;
}

// A label sheet covers the whole facility at most; this bounds the work of one request.
const MAX_LABELS = 1000;

/**
 * One label per active tool, with its QR code as SVG (sharp at any print size). Error
 * correction level M survives the scuffs and cleanroom wipes a label meets.
 */
export async function getLabels(deps: AppDeps, query: { areaId?: number }): Promise<{ items: ToolLabel[] }> {
  const where = query.areaId ? { retiredAt: null, areaId: query.areaId } : { retiredAt: null };
  const tools = await Tool.findAll({
    where,
    include: [{ model: Area, as: 'area', attributes: ['name', 'sortOrder'] }],
    order: [
      [{ model: Area, as: 'area' }, 'sortOrder', 'ASC'],
      [{ model: Area, as: 'area' }, 'name', 'ASC'],
      ['name', 'ASC'],
    ],
    limit: MAX_LABELS,
  });
  const items = await Promise.all(
    tools.map(async (t) => {
      const url = toolUrl(deps.config.publicUrl, t.code);
      const svg = await QRCode.toString(url, { type: 'svg', errorCorrectionLevel: 'M', margin: 2 });
      return { toolId: t.id, code: t.code, name: t.name, areaName: (t as Tool & { area: Area }).area.name, url, svg };
    }),
  );
  return { items };
}
