/** What each role may do, in words a lab manager would use. */
export const ROLE_OPTIONS = [
  { value: 'viewer', label: 'Viewer: reads runs and reports' },
  { value: 'technician', label: 'Technician: packs, runs, notes' },
  { value: 'admin', label: 'Lab manager: users, benches, settings' },
] as const;
