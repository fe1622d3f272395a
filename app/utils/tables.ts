import {
  columnFilteringFeature, createFilteredRowModel, createPaginatedRowModel, createSortedRowModel,
  filterFn_equalsString, filterFn_includesString, globalFilteringFeature, rowPaginationFeature,
  rowSortingFeature, sortFn_alphanumeric, sortFn_basic, tableFeatures,
} from '@tanstack/vue-table'

/**
 * The features every list table of the app uses (TanStack Table v9 registers them explicitly):
 * sorting, column and global filtering, paging. Stateless configuration, shared by all tables.
 */
export const listFeatures = tableFeatures({
  rowSortingFeature,
  sortedRowModel: createSortedRowModel(),
  sortFns: { alphanumeric: sortFn_alphanumeric, basic: sortFn_basic },
  columnFilteringFeature,
  globalFilteringFeature,
  filteredRowModel: createFilteredRowModel(),
  filterFns: { includesString: filterFn_includesString, equalsString: filterFn_equalsString },
  rowPaginationFeature,
  paginatedRowModel: createPaginatedRowModel(),
})
export type ListFeatures = typeof listFeatures

/** aria-sort for a column's sort state. */
export function ariaSort(dir: false | 'asc' | 'desc'): 'ascending' | 'descending' | 'none' {
  return dir === 'asc' ? 'ascending' : dir === 'desc' ? 'descending' : 'none'
}

/** The sort mark shown beside a header (decorative; aria-sort carries the meaning). */
export function sortMark(dir: false | 'asc' | 'desc'): string {
  return dir === 'asc' ? '▲' : dir === 'desc' ? '▼' : '↕'
}
