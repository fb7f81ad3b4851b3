import { collectionHandlers } from '@/lib/api/crud';
import { engines } from '@/lib/db/queries/fleet-entities';

/** GET: list (any member). POST: create (analyst, admin); 422 lists every problem. */
export const { GET, POST } = collectionHandlers(engines);
