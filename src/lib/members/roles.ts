/** Roles within an organisation. Shared by the server guards and the page (to show or hide actions). */
export const ROLES = ['assessor', 'supervisor', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
	assessor: 'Assessor',
	supervisor: 'Supervisor',
	admin: 'Admin'
};
