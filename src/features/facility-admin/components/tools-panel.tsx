import { useState } from 'react';
import { Alert } from '@/components/ui/alert';
import { Button } from '@/components/ui/button';
import { Card } from '@/components/ui/card';
import { Spinner } from '@/components/ui/spinner';
import { TextField } from '@/components/ui/text-field';
import { ADMIN_TOOLS_PAGE, useAdminTools } from '@/features/facility-admin/api/get-admin-tools';
import { useAdminAreas } from '@/features/facility-admin/api/get-admin-areas';
import { FieldSelect } from '@/features/facility-admin/components/field-select';
import { ToolEditor } from '@/features/facility-admin/components/tool-editor';

/** Tools: find, add, edit, retire. The list is paged and filtered on the server. */
export function ToolsPanel() {
  const [q, setQ] = useState('');
  const [areaId, setAreaId] = useState<number | null>(null);
  const [includeRetired, setIncludeRetired] = useState(false);
  const [offset, setOffset] = useState(0);
  const [editing, setEditing] = useState<number | 'new' | null>(null);
  const [message, setMessage] = useState<string | null>(null);
  const tools = useAdminTools({ q, areaId, includeRetired, offset });
  const areas = useAdminAreas(false);

  const close = (m?: string) => {
    setEditing(null);
    if (m) setMessage(m);
  };

  if (editing !== null) {
    return (
      <Card as="section" title={editing === 'new' ? 'New tool' : 'Edit tool'}>
        <ToolEditor toolId={editing === 'new' ? null : editing} onClose={close} />
      </Card>
    );
  }

  return (
    <div className="flex flex-col gap-4">
      {message && (
        <Alert tone="success" live>
          {message}
        </Alert>
      )}
      <div className="flex flex-wrap items-end gap-3">
        <Button
          onClick={() => {
            setMessage(null);
            setEditing('new');
          }}
        >
          Add a tool
        </Button>
        <TextField
          label="Search"
          type="search"
          placeholder="Name or code"
          value={q}
          onChange={(e) => {
            setQ(e.target.value);
            setOffset(0);
          }}
          className="w-full sm:w-64"
        />
        <FieldSelect
          label="Area"
          value={areaId ?? ''}
          onChange={(e) => {
            setAreaId(e.target.value ? Number(e.target.value) : null);
            setOffset(0);
          }}
          className="w-full sm:w-56"
        >
          <option value="">All areas</option>
          {areas.data?.items.map((a) => (
            <option key={a.id} value={a.id}>
              {a.name}
            </option>
          ))}
        </FieldSelect>
        <label className="inline-flex min-h-11 items-center gap-2 text-sm text-ink">
          <input
            type="checkbox"
            className="size-5"
            checked={includeRetired}
            onChange={(e) => {
              setIncludeRetired(e.target.checked);
              setOffset(0);
            }}
          />
          Show retired tools
        </label>
      </div>
      {tools.isPending && <Spinner label="Loading tools…" showLabel />}
      {tools.isError && <Alert tone="danger">{tools.error.message}</Alert>}
      {tools.data && (
        <>
          <div className="overflow-x-auto rounded-lg border border-line">
            <table className="w-full text-left text-sm">
              <caption className="sr-only">Tools</caption>
              <thead className="border-b border-line bg-sunken text-xs font-semibold tracking-wide text-muted uppercase">
                <tr>
                  <th scope="col" className="px-3 py-2">
                    Tool
                  </th>
                  <th scope="col" className="hidden px-3 py-2 md:table-cell">
                    Area
                  </th>
                  <th scope="col" className="hidden px-3 py-2 lg:table-cell">
                    Engineers
                  </th>
                  <th scope="col" className="hidden px-3 py-2 sm:table-cell">
                    Modules
                  </th>
                  <th scope="col" className="px-3 py-2">
                    <span className="sr-only">Actions</span>
                  </th>
                </tr>
              </thead>
              <tbody>
                {tools.data.items.map((t) => (
                  <tr key={t.id} className="border-b border-line last:border-0">
                    <td className="px-3 py-2">
                      <span className="font-semibold text-ink">{t.name}</span>{' '}
                      <span className="font-mono text-xs text-muted">{t.code}</span>
                      {t.retiredAt && <span className="ml-2 text-xs font-semibold text-muted uppercase">Retired</span>}
                      {t.criticality !== 'normal' && <span className="block text-xs text-muted">Criticality: {t.criticality}</span>}
                    </td>
                    <td className="hidden px-3 py-2 md:table-cell">{t.area?.name}</td>
                    <td className="hidden px-3 py-2 lg:table-cell">
                      {t.primaryEngineer?.name ?? '—'}
                      <span className="block text-xs text-muted">backup: {t.backupEngineer?.name ?? '—'}</span>
                    </td>
                    <td className="hidden px-3 py-2 tabular-nums sm:table-cell">{t.moduleCount}</td>
                    <td className="px-3 py-2 text-right">
                      <Button
                        variant="secondary"
                        onClick={() => {
                          setMessage(null);
                          setEditing(t.id);
                        }}
                        aria-label={`Edit ${t.name}`}
                      >
                        Edit
                      </Button>
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <nav aria-label="Tool list pages" className="flex flex-wrap items-center gap-3">
            <Button variant="secondary" disabled={offset === 0} onClick={() => setOffset(Math.max(0, offset - ADMIN_TOOLS_PAGE))}>
              Previous
            </Button>
            <span className="text-sm text-muted tabular-nums">
              {tools.data.total === 0
                ? 'No tools'
                : `${offset + 1}–${Math.min(offset + ADMIN_TOOLS_PAGE, tools.data.total)} of ${tools.data.total}`}
            </span>
            <Button
              variant="secondary"
              disabled={offset + ADMIN_TOOLS_PAGE >= tools.data.total}
              onClick={() => setOffset(offset + ADMIN_TOOLS_PAGE)}
            >
              Next
            </Button>
          </nav>
        </>
      )}
    </div>
  );
}
