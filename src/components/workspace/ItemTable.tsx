/**
 * Every per-item statistic of the audit in one table (@tanstack/react-table): sortable by any
 * column, filtered by text, scale or proposal, with the columns the reader chooses. Numbers are
 * right-aligned under right-aligned headers.
 */
import { useMemo, useState } from 'react';
import {
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type ColumnDef,
  type FilterFn,
  type SortingState,
  type VisibilityState,
} from '@tanstack/react-table';
import type { ItemRow } from './item-rows';

type Numeric = { numeric: true; title: string };
type Textual = { numeric: false; title: string };

function fixed(value: number | null, digits: number): string {
  return value === null ? '—' : value.toFixed(digits).replace('-', '−');
}
function share(value: number | null): string {
  return value === null ? '—' : `${(value * 100).toFixed(1)}%`;
}

const numberColumn = (key: keyof ItemRow, header: string, title: string, render: (value: number | null, row: ItemRow) => string): ColumnDef<ItemRow> => ({
  id: key,
  // Absent values are undefined to the table, so they sort last in either direction.
  accessorFn: (row) => (row[key] as number | null) ?? undefined,
  header,
  meta: { numeric: true, title } satisfies Numeric,
  sortUndefined: 'last',
  sortingFn: 'basic',
  sortDescFirst: true,
  cell: (context) => render(context.getValue<number | undefined>() ?? null, context.row.original),
});

const columns: ColumnDef<ItemRow>[] = [
  {
    id: 'id',
    accessorKey: 'id',
    header: 'Item',
    meta: { numeric: false, title: 'Item id' } satisfies Textual,
    cell: (context) => (
      <span className="font-semibold">
        {context.row.original.id}
        {context.row.original.locked && <span className="chip ml-1">locked</span>}
        {!context.row.original.inMatrix && <span className="chip ml-1" title="Left out of the correlation matrix (no variance)">left out</span>}
      </span>
    ),
  },
  { id: 'scale', accessorFn: (row) => row.scale ?? '', header: 'Scale', meta: { numeric: false, title: 'Scale' } satisfies Textual },
  { id: 'text', accessorFn: (row) => row.text ?? '', header: 'Wording', meta: { numeric: false, title: 'Wording' } satisfies Textual, cell: (context) => <span className="block max-w-xs text-ink-soft">{context.getValue<string>() || '—'}</span> },
  numberColumn('n', 'n', 'Respondents who answered', (v) => (v === null ? '—' : String(v))),
  numberColumn('mean', 'Mean', 'Mean of the recoded answers', (v) => fixed(v, 2)),
  numberColumn('sd', 'SD', 'Standard deviation', (v) => fixed(v, 2)),
  numberColumn('missingRate', 'Missing', 'Share of respondents without an answer', share),
  numberColumn('floor', 'Floor', 'Share at the lowest answer', share),
  numberColumn('ceiling', 'Ceiling', 'Share at the highest answer', share),
  numberColumn('vif', 'VIF', 'Variance inflation factor (null: exact dependency or left out)', (v) => fixed(v, 2)),
  numberColumn('tolerance', 'Tolerance', '1 / VIF', (v) => fixed(v, 3)),
  numberColumn('msa', 'MSA', 'Measure of sampling adequacy (KMO per item)', (v) => fixed(v, 2)),
  numberColumn('itemRest', 'Item-rest r', 'Correlation with the rest of its scale', (v) => fixed(v, 2)),
  numberColumn('alphaIfDeleted', 'Alpha if deleted', "Its scale's alpha without it", (v) => fixed(v, 3)),
  numberColumn('keeperScore', 'Keeper score', 'How well it would serve as its cluster’s keeper (items in an overlap cluster)', (v) => fixed(v, 2)),
  {
    id: 'partner',
    accessorFn: (row) => row.partner ?? '',
    header: 'Strongest partner',
    meta: { numeric: false, title: 'The item it correlates with most' } satisfies Textual,
  },
  numberColumn('partnerR', 'Partner r', 'Correlation with the strongest partner', (v) => fixed(v, 2)),
  numberColumn('wording', 'Wording similarity', 'Wording similarity with its partner (where measured)', (v) => fixed(v, 2)),
  { id: 'proposal', accessorFn: (row) => row.proposal ?? '', header: 'Proposal', meta: { numeric: false, title: 'What the audit proposes' } satisfies Textual, cell: (context) => context.getValue<string>() || '—' },
];

const textFilter: FilterFn<ItemRow> = (row, _columnId, value: string) => {
  const needle = value.trim().toLowerCase();
  if (!needle) return true;
  const { id, scale, text, proposal } = row.original;
  return [id, scale, text, proposal].some((field) => field?.toLowerCase().includes(needle));
};

/**
 * The island: a thin shell on purpose. To learn whether an island is a React component, Astro's
 * React renderer calls its function once outside the real render (`check` in @astrojs/react),
 * which here built the whole table a second time on every page; the table is built in
 * {@link ItemTableBody}, which that probe does not call (docs/decisions/023-page-cost.md).
 */
export default function ItemTable({ rows }: { rows: ItemRow[] }) {
  return <ItemTableBody rows={rows} />;
}

function ItemTableBody({ rows }: { rows: ItemRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([]);
  const [search, setSearch] = useState('');
  const [scale, setScale] = useState('');
  const [onlyProposed, setOnlyProposed] = useState(false);
  const [visibility, setVisibility] = useState<VisibilityState>({ text: false, tolerance: false });
  const scales = useMemo(() => [...new Set(rows.map((row) => row.scale).filter((s): s is string => s !== null))], [rows]);
  const data = useMemo(() => rows.filter((row) => (!scale || row.scale === scale) && (!onlyProposed || row.proposal !== null)), [rows, scale, onlyProposed]);
  const table = useReactTable({
    data,
    columns,
    state: { sorting, globalFilter: search, columnVisibility: visibility },
    onSortingChange: setSorting,
    onGlobalFilterChange: setSearch,
    onColumnVisibilityChange: setVisibility,
    globalFilterFn: textFilter,
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });
  const shown = table.getRowModel().rows;

  return (
    <div className="grid gap-3">
      <div className="flex flex-wrap items-end gap-3 text-sm">
        <div>
          <label className="label" htmlFor="item-table-search">Find an item</label>
          <input id="item-table-search" className="field w-56 py-1 text-sm" value={search} onChange={(event) => setSearch(event.target.value)} placeholder="id, scale, wording or proposal" data-testid="item-table-search" />
        </div>
        <div>
          <label className="label" htmlFor="item-table-scale">Scale</label>
          <select id="item-table-scale" className="field py-1 text-sm" value={scale} onChange={(event) => setScale(event.target.value)}>
            <option value="">All scales</option>
            {scales.map((s) => (
              <option key={s} value={s}>{s}</option>
            ))}
          </select>
        </div>
        <label className="inline-flex items-center gap-1.5 pb-1.5">
          <input type="checkbox" checked={onlyProposed} onChange={(event) => setOnlyProposed(event.target.checked)} /> Only items in a proposal
        </label>
        <details className="relative pb-1.5" data-testid="item-table-columns">
          <summary className="cursor-pointer text-spruce-700">Columns ({table.getVisibleLeafColumns().length} of {columns.length})</summary>
          <fieldset className="panel absolute z-10 mt-1 grid w-64 gap-1 p-3 shadow-md">
            <legend className="sr-only">Columns to show</legend>
            {table.getAllLeafColumns().map((column) => (
              <label key={column.id} className="inline-flex items-center gap-1.5">
                <input type="checkbox" checked={column.getIsVisible()} disabled={column.id === 'id'} onChange={column.getToggleVisibilityHandler()} />
                {(column.columnDef.meta as Numeric | Textual).title}
              </label>
            ))}
          </fieldset>
        </details>
        <p className="ml-auto pb-1.5 text-ink-soft" data-testid="item-table-count">
          {shown.length} of {rows.length} items
        </p>
      </div>
      <div className="panel overflow-x-auto">
        <table className="dense-table text-sm" data-testid="item-table">
          <thead>
            {table.getHeaderGroups().map((group) => (
              <tr key={group.id}>
                {group.headers.map((header) => {
                  const meta = header.column.columnDef.meta as Numeric | Textual;
                  const sorted = header.column.getIsSorted();
                  return (
                    <th key={header.id} scope="col" className={`${meta.numeric ? 'num' : ''} whitespace-nowrap px-2`} aria-sort={sorted === 'asc' ? 'ascending' : sorted === 'desc' ? 'descending' : 'none'}>
                      <button type="button" className={`inline-flex items-center gap-1 uppercase tracking-[0.06em] ${meta.numeric ? 'flex-row-reverse' : ''}`} title={meta.title} onClick={header.column.getToggleSortingHandler()} data-testid={`item-table-sort-${header.id}`}>
                        {flexRender(header.column.columnDef.header, header.getContext())}
                        <span aria-hidden="true" className="w-2 text-ink-faint">{sorted === 'asc' ? '▲' : sorted === 'desc' ? '▼' : ''}</span>
                      </button>
                    </th>
                  );
                })}
              </tr>
            ))}
          </thead>
          <tbody>
            {shown.map((row) => (
              <tr key={row.id} data-testid="item-table-row" data-item={row.original.id}>
                {row.getVisibleCells().map((cell) => (
                  <td key={cell.id} className={`${(cell.column.columnDef.meta as Numeric | Textual).numeric ? 'num' : ''} px-2`}>
                    {flexRender(cell.column.columnDef.cell ?? ((context) => String(context.getValue() ?? '')), cell.getContext())}
                  </td>
                ))}
              </tr>
            ))}
            {shown.length === 0 && (
              <tr>
                <td colSpan={table.getVisibleLeafColumns().length} className="text-ink-soft">No item matches.</td>
              </tr>
            )}
          </tbody>
        </table>
      </div>
    </div>
  );
}
