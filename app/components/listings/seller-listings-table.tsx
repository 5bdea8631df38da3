import {
  createColumnHelper,
  flexRender,
  getCoreRowModel,
  getFilteredRowModel,
  getSortedRowModel,
  useReactTable,
  type SortingState,
} from "@tanstack/react-table";
import { useMemo, useState } from "react";
import { Link } from "react-router";
import { Table, Td, Th, Tr, cx } from "~/components/ui";
import { countryName, labelOf, machineCategories } from "~/modules/listings/catalogue";
import { listingStatuses } from "~/modules/listings/statuses";
import { formatMoney } from "~/modules/units/format";
import { StatusBadge } from "./status-badge";
import { formatDate } from "~/modules/units/dates";
import { bookingStatusLabels, type BookingStatus } from "~/modules/inspections/rules";

export type SellerListingRow = {
  id: string;
  slug: string;
  title: string;
  category: string;
  status: string;
  priceMinor: number;
  currency: string;
  city: string;
  country: string;
  coverUrl: string | null;
  inquiries: number;
  watchers: number;
  views: number;
  grade: string | null;
  bookingStatus: BookingStatus | null;
  createdAt: string;
  updatedAt: string;
};

/** A booking in one of these states is under way: no second "Book an inspection" is offered. */
const bookingUnderWay: BookingStatus[] = ["awaiting_payment", "paid", "accepted", "report_filed"];

const column = createColumnHelper<SellerListingRow>();

/** The seller's listings: sortable columns, a status filter and a search over make, model and place. */
export function SellerListingsTable({ rows }: { rows: SellerListingRow[] }) {
  const [sorting, setSorting] = useState<SortingState>([{ id: "createdAt", desc: true }]);
  const [search, setSearch] = useState("");
  const [status, setStatus] = useState("");

  const columns = useMemo(
    () => [
      column.accessor("title", {
        header: "Machine",
        cell: ({ row }) => (
          <div className="flex min-w-56 items-center gap-3">
            {row.original.coverUrl ? (
              <img src={row.original.coverUrl} alt="" className="h-12 w-16 shrink-0 rounded object-cover" width={64} height={48} />
            ) : (
              <span className="flex h-12 w-16 shrink-0 items-center justify-center rounded bg-ink-100 text-xs text-ink-500">No photo</span>
            )}
            <div>
              <Link to={`/sell/listings/${row.original.id}`} className="font-bold text-ink-900 hover:underline">
                {row.original.title}
              </Link>
              <p className="text-xs text-ink-500">{labelOf(machineCategories, row.original.category)}</p>
            </div>
          </div>
        ),
      }),
      column.accessor("status", {
        header: "Status",
        filterFn: "equalsString",
        cell: ({ getValue }) => <StatusBadge status={getValue()} />,
      }),
      column.accessor("priceMinor", {
        header: "Price",
        cell: ({ row }) => <span className="tabular whitespace-nowrap">{formatMoney(row.original.priceMinor, row.original.currency)}</span>,
      }),
      column.accessor((row) => `${row.city}, ${countryName(row.country)}`, { id: "place", header: "Location" }),
      column.accessor((row) => row.grade ?? "", {
        id: "verification",
        header: "Verification",
        cell: ({ row }) =>
          row.original.grade ? (
            <span className="whitespace-nowrap font-semibold text-within">Verified · grade {row.original.grade}</span>
          ) : (
            <span className="whitespace-nowrap text-ink-500">Not yet verified</span>
          ),
      }),
      column.accessor((row) => row.bookingStatus ?? "", {
        id: "inspection",
        header: "Inspection",
        cell: ({ row }) => {
          const { bookingStatus, status, slug } = row.original;
          const canBook = status === "published" && !(bookingStatus && bookingUnderWay.includes(bookingStatus));
          return (
            <div className="min-w-36 space-y-1">
              <p className="text-sm text-ink-700">{bookingStatus ? bookingStatusLabels[bookingStatus] : "None booked"}</p>
              {canBook ? (
                <Link to={`/machines/${slug}/book`} className="text-sm font-semibold text-ink-900 underline underline-offset-2">
                  Book an inspection
                </Link>
              ) : null}
            </div>
          );
        },
      }),
      column.accessor("views", { header: "Views", cell: ({ getValue }) => <span className="tabular">{getValue()}</span> }),
      column.accessor("inquiries", { header: "Questions", cell: ({ getValue }) => <span className="tabular">{getValue()}</span> }),
      column.accessor("watchers", { header: "Watching", cell: ({ getValue }) => <span className="tabular">{getValue()}</span> }),
      column.accessor("createdAt", {
        header: "Listed",
        cell: ({ getValue }) => <span className="whitespace-nowrap">{formatDate(getValue())}</span>,
      }),
      column.accessor("updatedAt", {
        header: "Last change",
        cell: ({ getValue }) => <span className="whitespace-nowrap">{formatDate(getValue())}</span>,
      }),
    ],
    [],
  );

  const table = useReactTable({
    data: rows,
    columns,
    state: { sorting, globalFilter: search, columnFilters: status ? [{ id: "status", value: status }] : [] },
    onSortingChange: setSorting,
    globalFilterFn: (row, _columnId, value: string) => {
      const haystack = `${row.original.title} ${row.original.city} ${countryName(row.original.country)}`.toLowerCase();
      return value.toLowerCase().split(/\s+/).every((word) => haystack.includes(word));
    },
    getCoreRowModel: getCoreRowModel(),
    getSortedRowModel: getSortedRowModel(),
    getFilteredRowModel: getFilteredRowModel(),
  });

  const shown = table.getRowModel().rows;
  return (
    <div className="space-y-4">
      <div className="flex flex-col gap-3 sm:flex-row sm:items-end">
        <label className="block flex-1 text-sm font-semibold text-ink-800">
          Search
          <input
            type="search"
            value={search}
            onChange={(event) => setSearch(event.target.value)}
            placeholder="Make, model or town"
            className="mt-1.5 block w-full rounded-control border border-ink-300 bg-white px-3 py-2 text-base text-ink-900 shadow-xs placeholder:text-ink-400 focus:outline-none focus:ring-2 focus:ring-brass-400"
          />
        </label>
        <label className="block text-sm font-semibold text-ink-800 sm:w-52">
          Status
          <select
            value={status}
            onChange={(event) => setStatus(event.target.value)}
            className="mt-1.5 block w-full rounded-control border border-ink-300 bg-white px-3 py-2 text-base text-ink-900 shadow-xs focus:outline-none focus:ring-2 focus:ring-brass-400"
          >
            <option value="">All statuses</option>
            {listingStatuses.map((option) => (
              <option key={option.value} value={option.value}>
                {option.label}
              </option>
            ))}
          </select>
        </label>
      </div>
      <Table caption="Your listings">
        <thead>
          {table.getHeaderGroups().map((group) => (
            <tr key={group.id}>
              {group.headers.map((header) => {
                const sorted = header.column.getIsSorted();
                return (
                  <Th key={header.id} aria-sort={sorted === "asc" ? "ascending" : sorted === "desc" ? "descending" : "none"}>
                    <button
                      type="button"
                      onClick={header.column.getToggleSortingHandler()}
                      className={cx("inline-flex items-center gap-1 uppercase", sorted ? "text-ink-900" : "hover:text-ink-900")}
                    >
                      {flexRender(header.column.columnDef.header, header.getContext())}
                      <span aria-hidden="true" className="text-[0.65rem]">
                        {sorted === "asc" ? "▲" : sorted === "desc" ? "▼" : "↕"}
                      </span>
                    </button>
                  </Th>
                );
              })}
            </tr>
          ))}
        </thead>
        <tbody>
          {shown.map((row) => (
            <Tr key={row.id} data-listing-id={row.original.id}>
              {row.getVisibleCells().map((cell) => (
                <Td key={cell.id} className="align-middle">
                  {flexRender(cell.column.columnDef.cell, cell.getContext())}
                </Td>
              ))}
            </Tr>
          ))}
          {shown.length === 0 ? (
            <Tr>
              <Td colSpan={columns.length} className="py-8 text-center text-ink-500">
                No listing matches this search.
              </Td>
            </Tr>
          ) : null}
        </tbody>
      </Table>
      <p className="text-sm text-ink-500">
        {shown.length} of {rows.length} listings
      </p>
    </div>
  );
}
