import 'server-only';
import type { Access } from '@/lib/auth/access';
import { CAN } from '@/lib/auth/roles';
import type { WorkspaceView } from './types';

/** The part of a member's access that client components need. */
export function toWorkspaceView(access: Access): WorkspaceView {
  return {
    slug: access.workspace.slug,
    canEdit: (CAN.edit as readonly string[]).includes(access.role),
    units: access.workspace.settings.units,
    negativeStyle: access.workspace.settings.negativeStyle,
    currency: access.workspace.currency,
    numberFormat: access.workspace.settings.numberFormat,
  };
}
