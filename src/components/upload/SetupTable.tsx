import { useMemo, useState } from 'react';
import {
  createColumnHelper, flexRender, getCoreRowModel, getFilteredRowModel, useReactTable, type FilterFn,
} from '@tanstack/react-table';
import type { ColumnRole, DurationUnit } from '../../lib/ingest/types';
import { roleChoices, type SetupRow } from './setup-rows';

const helper = createColumnHelper<SetupRow>();

type Show = 'all' | 'items' | 'others';

const showFilter: FilterFn<SetupRow> = (row, _columnId, value: { show: Show; search: string }) => {
  const { show, search } = value;
  if (show === 'items' && row.original.role !== 'item') return false;
  if (show === 'others' && row.original.role === 'item') return false;
  const needle = search.trim().toLowerCase();
  if (needle === '') return true;
  return [row.original.column, row.original.id, row.original.scale, row.original.text].some((text) => text.toLowerCase().includes(needle));
};

function profileLine(row: SetupRow): string {
  const p = row.profile;
  const parts = [`${p.nonBlank} filled`];
  if (p.blank > 0) parts.push(`${p.blank} blank`);
  if (p.minimum !== null && p.maximum !== null) parts.push(p.minimum === p.maximum ? `all ${p.minimum}` : `${p.minimum} to ${p.maximum}`);
  parts.push(`${p.distinct} distinct`);
  return parts.join(' · ');
}

const usesItemFields = (row: SetupRow) => row.role === 'item' || row.role === 'outcome';

function Count({ value, what }: { value: number; what: string }) {
  return (
    <span className={value > 0 ? 'font-semibold text-brick-700' : 'text-ink-soft'} title={`${value} ${what}`}>
      {value}
    </span>
  );
}

/**
 * The column setup form: one row per column with its proposed role and the reason, the item
 * fields, and the cells that will be set to missing (out of range, not numeric, unmapped labels).
 */
export default function SetupTable({ rows, onChange }: { rows: SetupRow[]; onChange: (index: number, patch: Partial<SetupRow>) => void }) {
  const [show, setShow] = useState<Show>('all');
  const [search, setSearch] = useState('');

  const columns = useMemo(() => {
    const input = (row: SetupRow, index: number, key: 'id' | 'scale' | 'facet' | 'min' | 'max' | 'missing' | 'text', label: string, className: string, inputMode?: 'decimal') => (
      <input
        className={`field px-1.5 py-1 text-sm placeholder:text-ink-faint ${className}`}
        aria-label={`${label} of ${row.column}`}
        placeholder={key === 'missing' ? 'none' : key === 'facet' ? 'facet (optional)' : label.toLowerCase()}
        inputMode={inputMode}
        value={row[key]}
        onChange={(event) => onChange(index, { [key]: event.target.value })}
        data-testid={`setup-${key}`}
      />
    );
    const none = <span className="text-ink-faint" aria-hidden="true">–</span>;
    return [
      helper.accessor('column', {
        header: 'Column, why, and wording',
        cell: (info) => {
          const row = info.row.original;
          return (
            <div className="w-[12rem] xl:w-[21rem]">
              <div className="break-words font-mono text-[0.8125rem] font-semibold text-ink">{row.column}</div>
              <div className="text-xs leading-snug text-ink-soft">{row.reason}</div>
              <div className="mt-0.5 text-xs text-ink-faint">{profileLine(row)}</div>
              {row.labelSource === 'answer-scale' && (
                <div className="mt-0.5 text-xs font-semibold text-ochre-700">Answer texts mapped by guess ({row.answerScale}): check them</div>
              )}
              {row.counts && (
                // Below xl the "Set to missing" column is hidden (tablet width); its counts show here.
                <div className="mt-0.5 text-xs text-ink-soft xl:hidden" data-testid="setup-counts-inline">
                  Set to missing: <Count value={row.counts.outOfRange} what="values outside the valid range" /> out of range · <Count value={row.counts.nonNumeric} what="cells that are not numbers" /> not numeric · <Count value={row.counts.unmappedLabel} what="answer texts matching no value label" /> unmapped
                </div>
              )}
              {usesItemFields(row) && <div className="mt-1.5">{input(row, info.row.index, 'text', 'Wording', 'w-full')}</div>}
            </div>
          );
        },
      }),
      helper.accessor('role', {
        header: 'Role',
        cell: (info) => {
          const row = info.row.original;
          return (
            <div className="w-[7.5rem] space-y-1 lg:w-[8.5rem]">
              <select
                className="field px-1.5 py-1 text-sm"
                aria-label={`Role of ${row.column}`}
                value={row.role}
                onChange={(event) => onChange(info.row.index, { role: event.target.value as ColumnRole })}
                data-testid="setup-role"
              >
                {roleChoices.map((choice) => (
                  <option key={choice.value} value={choice.value}>{choice.label}</option>
                ))}
              </select>
              {row.role === 'duration' && (
                <select
                  className="field px-1.5 py-1 text-sm"
                  aria-label={`Unit of ${row.column}`}
                  value={row.durationUnit}
                  onChange={(event) => onChange(info.row.index, { durationUnit: event.target.value as DurationUnit })}
                >
                  <option value="seconds">seconds</option>
                  <option value="minutes">minutes</option>
                  <option value="milliseconds">milliseconds</option>
                </select>
              )}
            </div>
          );
        },
      }),
      helper.display({
        id: 'idAndScale',
        header: 'Item id, scale, facet',
        cell: (info) => {
          const row = info.row.original;
          if (!usesItemFields(row)) return none;
          return (
            <div className="w-[7rem] space-y-1 lg:w-32">
              {input(row, info.row.index, 'id', 'Item id', 'w-full')}
              {input(row, info.row.index, 'scale', 'Scale', 'w-full')}
              {input(row, info.row.index, 'facet', 'Facet', 'w-full')}
            </div>
          );
        },
      }),
      helper.accessor('reverse', {
        header: () => <abbr title="Reverse-keyed: recoded as min + max − answer" className="no-underline">Rev.</abbr>,
        cell: (info) => {
          const row = info.row.original;
          if (!usesItemFields(row)) return none;
          return (
            <input
              type="checkbox"
              className="mt-1.5 h-4 w-4 accent-spruce-700"
              aria-label={`${row.column} is reverse-keyed`}
              checked={row.reverse}
              onChange={(event) => onChange(info.row.index, { reverse: event.target.checked })}
              data-testid="setup-reverse"
            />
          );
        },
      }),
      helper.display({
        id: 'range',
        header: 'Valid range',
        cell: (info) => {
          const row = info.row.original;
          if (!usesItemFields(row)) return none;
          return (
            <div className="flex w-[7rem] items-center gap-1 lg:w-[8.25rem]">
              {input(row, info.row.index, 'min', 'Min', 'w-12 lg:w-14', 'decimal')}
              <span className="text-xs text-ink-soft">to</span>
              {input(row, info.row.index, 'max', 'Max', 'w-12 lg:w-14', 'decimal')}
            </div>
          );
        },
      }),
      helper.accessor('missing', {
        header: 'Missing codes',
        cell: (info) => (usesItemFields(info.row.original) ? input(info.row.original, info.row.index, 'missing', 'Missing codes', 'w-16 lg:w-20') : none),
      }),
      helper.display({
        id: 'cells',
        header: 'Set to missing',
        cell: (info) => {
          const counts = info.row.original.counts;
          if (!counts) return none;
          return (
            <dl className="grid w-[8.5rem] grid-cols-[1fr_auto] gap-x-2 text-xs leading-5" data-testid="setup-counts">
              <dt className="text-ink-soft">out of range</dt>
              <dd className="num"><Count value={counts.outOfRange} what="values outside the valid range" /></dd>
              <dt className="text-ink-soft">not numeric</dt>
              <dd className="num"><Count value={counts.nonNumeric} what="cells that are not numbers" /></dd>
              <dt className="text-ink-soft">unmapped label</dt>
              <dd className="num"><Count value={counts.unmappedLabel} what="answer texts matching no value label" /></dd>
            </dl>
          );
        },
      }),
    ];
  }, [onChange]);

  const globalFilter = useMemo(() => ({ show, search }), [show, search]);
  const table = useReactTable({
    data: rows,
    columns,
    getRowId: (row) => row.column,
    getCoreRowModel: getCoreRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
    state: { globalFilter },
    // No pagination here; a changed filter or edit must not queue a state reset (it would loop).
    autoResetAll: false,
    globalFilterFn: showFilter,
    getColumnCanGlobalFilter: () => true,
  });

  const itemCount = rows.filter((row) => row.role === 'item').length;
  const ignored = rows.filter((row) => row.role === 'ignore').length;
  const visible = table.getRowModel().rows;
  return (
    <div>
      <div className="mb-3 flex flex-wrap items-end gap-3">
        <div>
          <label className="label" htmlFor="setup-show">Show</label>
          <select id="setup-show" className="field py-1 text-sm" value={show} onChange={(event) => setShow(event.target.value as Show)}>
            <option value="all">All {rows.length} columns</option>
            <option value="items">Items ({itemCount})</option>
            <option value="others">Other roles ({rows.length - itemCount})</option>
          </select>
        </div>
        <div>
          <label className="label" htmlFor="setup-search">Find a column</label>
          <input id="setup-search" className="field w-56 py-1 text-sm" value={search} onChange={(event) => setSearch(event.target.value)} placeholder="name, id, scale or wording" />
        </div>
        <p className="ml-auto text-sm text-ink-soft" data-testid="setup-tally">
          <span className="font-semibold text-ink">{itemCount}</span> items · {ignored} ignored · {rows.length - itemCount - ignored} other
        </p>
      </div>
      <div className="panel overflow-x-auto">
        <table className="dense-table setup-table text-sm" data-testid="setup-table">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => (
                  <th key={header.id} scope="col" className={`px-1.5 lg:px-2 ${header.column.id === 'cells' ? 'hidden xl:table-cell' : ''}`}>
                    {flexRender(header.column.columnDef.header, header.getContext())}
                  </th>
                ))}
              </tr>
            ))}
          </thead>
          <tbody>
            {visible.map((row) => (
              <tr key={row.id} data-testid="setup-row" data-column={row.original.column} className={row.original.role === 'ignore' ? 'bg-paper' : ''}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`px-1.5 lg:px-2 ${cell.column.id === 'cells' ? 'hidden xl:table-cell' : ''}`}>
                    {flexRender(cell.column.columnDef.cell, cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {visible.length === 0 && (
              <tr>
                <td colSpan={columns.length} className="text-ink-soft">No column matches.</td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
