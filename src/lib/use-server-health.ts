import { useQuery } from '@tanstack/react-query';
import { HealthSchema, type Health } from '../../shared/schemas/health';

/** How often the app asks while all is well, and while the database is away. */
const HEALTH_EVERY_MS = 15_000;
const HEALTH_EVERY_WHILE_AWAY_MS = 2_000;

/** GET /api/health; a 503 carries the same body. Null when the server has no health endpoint or cannot be reached. */
async function fetchHealth(): Promise<Health | null> {
  try {
    const res = await fetch('/api/health', { credentials: 'same-origin' });
    const parsed = HealthSchema.safeParse(await res.json());
    return parsed.success ? parsed.data : null;
  } catch {
    return null;
  }
}

/** The server's health, polled; faster while the database is away so the banner clears soon after it returns. */
export function useServerHealth() {
  return useQuery({
    queryKey: ['health'],
    queryFn: fetchHealth,
    refetchInterval: (query) => (query.state.data?.database && query.state.data.database.state !== 'up' ? HEALTH_EVERY_WHILE_AWAY_MS : HEALTH_EVERY_MS),
  });
}
