/**
 * Roles and what each may do. The server checks every write against this table (deny by default);
 * the client uses the same table only to hide what a role cannot do.
 */
export const ROLES = ['admin', 'planner', 'engineer', 'trainer', 'viewer'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Admin',
  planner: 'Planner',
  engineer: 'Engineer',
  trainer: 'Trainer',
  viewer: 'Viewer',
};

export const ROLE_SUMMARIES: Record<Role, string> = {
  admin: 'Team lead: everything, plus inviting people and changing roles.',
  planner: 'Sequences tasks and routes, submits plans for review, approves plans authored by others.',
  engineer: 'Edits the station model, imports and exports it, plans and saves foot-restraint sockets.',
  trainer: 'Reads everything; writes annotations and saved training walkthroughs.',
  viewer: 'Reads everything.',
};

export const PERMISSIONS = {
  /** read any station, plan, annotation, walkthrough; run any computation */
  read: 'Read stations, plans, annotations and walkthroughs; compute routes, reach and timelines',
  'users:manage': 'Invite people, change roles, disable and enable accounts',
  'mailbox:read': 'Read the local mailbox of the development mail service',
  'stations:edit': 'Edit the station model: nodes, edges, hazards, segments, settings',
  'stations:import': 'Import and replace station models',
  'sockets:save': 'Save socket planner results as new sockets',
  'plans:edit': 'Create, edit and delete plans',
  'plans:submit': 'Submit a plan for review',
  'plans:review': 'Approve or return a plan authored by someone else',
  'annotations:write': 'Pin notes to the model, reply, attach images, resolve',
  'walkthroughs:edit': 'Create and edit saved walkthroughs',
  'server:stats': "See the compute workers' load and the memory their caches take",
  'runs:fly': 'Open runs of approved plans and log what happens during the EVA',
} as const;
export type Permission = keyof typeof PERMISSIONS;

const ALL = Object.keys(PERMISSIONS) as Permission[];

export const ROLE_PERMISSIONS: Record<Role, readonly Permission[]> = {
  admin: ALL,
  planner: ['read', 'plans:edit', 'plans:submit', 'plans:review', 'annotations:write', 'runs:fly'],
  engineer: ['read', 'stations:edit', 'stations:import', 'sockets:save', 'annotations:write'],
  trainer: ['read', 'annotations:write', 'walkthroughs:edit'],
  viewer: ['read'],
};

export interface Actor {
  role: Role;
}

export function can(user: Actor | null | undefined, permission: Permission): boolean {
  if (!user) return false;
  return ROLE_PERMISSIONS[user.role]?.includes(permission) ?? false;
}
