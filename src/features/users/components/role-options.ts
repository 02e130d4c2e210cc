import { ROLE_LABELS, ROLES } from '@shared/auth/permissions';

export const ROLE_OPTIONS = ROLES.map((role) => ({ value: role, label: ROLE_LABELS[role] }));
