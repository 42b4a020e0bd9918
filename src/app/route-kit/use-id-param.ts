import { useParams, type Params } from 'react-router-dom';

/** A numeric route parameter, or NaN (the page then shows "not found"). */
export function idParam(params: Params, name: string): number {
  const value = params[name];
  return value && /^\d+$/.test(value) ? Number(value) : Number.NaN;
}

/** The numeric route parameter `name` of the current route, or NaN. */
export function useIdParam(name: string): number {
  return idParam(useParams(), name);
}
