import type { Capability } from '#shared/utils/roles'

export interface NavItem { to: string, label: string, capability: Capability }

// Each role sees its own work (docs/design.md §D2.1); the server checks the same capabilities per route.
export const NAV_ITEMS: NavItem[] = [
  { to: '/', label: 'Overview', capability: 'view' },
  { to: '/alarms', label: 'Alarms', capability: 'view' },
  { to: '/units', label: 'Units', capability: 'view' },
  { to: '/tags', label: 'Tags', capability: 'view' },
  { to: '/shift-log', label: 'Shift log', capability: 'view' },
  { to: '/review/incidents', label: 'Incidents', capability: 'view' },
  { to: '/review/health', label: 'Alarm health', capability: 'view' },
  { to: '/workbench', label: 'Workbench', capability: 'configure' },
  { to: '/upload', label: 'Upload history', capability: 'configure' },
  { to: '/admin/users', label: 'Users', capability: 'administer' },
  { to: '/admin/gateways', label: 'Gateways', capability: 'administer' },
  { to: '/admin/opcua', label: 'OPC UA', capability: 'administer' },
  { to: '/admin/routes', label: 'Notification routes', capability: 'administer' },
  { to: '/admin/audit', label: 'Audit log', capability: 'administer' },
  { to: '/admin/storage', label: 'Storage', capability: 'administer' },
]
