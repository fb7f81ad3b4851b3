import { itemHandlers } from '@/lib/api/crud';
import { engines } from '@/lib/db/queries/fleet-entities';

/** GET: read. PUT: update with the version loaded (409 when stale). DELETE (?version=): remove. 404 for ids of other workspaces. */
export const { GET, PUT, DELETE } = itemHandlers(engines);
