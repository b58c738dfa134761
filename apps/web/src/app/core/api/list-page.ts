import { HttpParams } from '@angular/common/http';

/** One page of a list endpoint of the set-up API: the items and how many match in all. */
export interface ListPage<T> {
  items: T[];
  total: number;
}

/** Paging, sorting and text filter of a list endpoint (`?limit&offset&sort&order&q&includeArchived`). */
export interface ListQuery {
  limit?: number;
  offset?: number;
  sort?: string;
  order?: 'asc' | 'desc';
  q?: string;
  includeArchived?: boolean;
}

/** The query string of a list request; empty values are left out so the API applies its defaults. */
export function listParams(query: ListQuery = {}): HttpParams {
  let params = new HttpParams();
  if (query.limit !== undefined) params = params.set('limit', query.limit);
  if (query.offset !== undefined) params = params.set('offset', query.offset);
  if (query.sort) params = params.set('sort', query.sort);
  if (query.order) params = params.set('order', query.order);
  if (query.q) params = params.set('q', query.q);
  if (query.includeArchived) params = params.set('includeArchived', 'true');
  return params;
}
