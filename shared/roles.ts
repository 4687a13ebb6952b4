/**
 * Who may do what. The server enforces this table; the client only uses it to hide what a
 * role cannot do. The role-matrix test reads the expected outcome of every route from here.
 */
export const ROLES = ['nurse', 'charge', 'educator', 'admin'] as const;
export type Role = (typeof ROLES)[number];

export const PERMISSIONS = {
  /** Read the unit's board, infants, flowsheets and handover. */
  'chart:read': ['nurse', 'charge', 'educator'],
  /** Record readings, actions, corrections and skin-to-skin sessions. */
  'chart:write': ['nurse', 'charge'],
  /** Admit, move and discharge infants; assign nurses; acknowledge escalations. */
  'unit:manage': ['charge'],
  /** The review queue, teaching notes, reports and exports. */
  'review:work': ['educator'],
  /** Users, invitations, roster, units, beds, unit settings, the mailbox. */
  'admin:manage': ['admin'],
  /** The admission-temperature measure with the infants that missed it: the educator and the charge nurse. */
  'measure:read': ['charge', 'educator'],
  /** Import readings from a CSV file: clinical data, so a charting role. */
  'readings:import': ['charge'],
} as const satisfies Record<string, readonly Role[]>;

export type Permission = keyof typeof PERMISSIONS;

export function can(role: Role, permission: Permission): boolean {
  return (PERMISSIONS[permission] as readonly Role[]).includes(role);
}

export const ROLE_LABELS: Record<Role, string> = {
  nurse: 'Bedside nurse',
  charge: 'Charge nurse',
  educator: 'Unit educator',
  admin: 'Administrator',
};

/** Where each role lands after signing in. */
export const ROLE_HOME: Record<Role, string> = {
  nurse: '/infants',
  charge: '/board',
  educator: '/review',
  admin: '/admin',
};
