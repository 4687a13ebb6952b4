import type { Role } from '@/shared/roles';
import type { IconName } from '@/components/ui/icon';

export interface NavItem {
  href: '/infants' | '/board' | '/handover' | '/review' | '/reports' | '/admin' | '/settings';
  label: string;
  icon: IconName;
}

const ITEMS: Record<NavItem['href'], NavItem> = {
  '/infants': { href: '/infants', label: 'My infants', icon: 'cot' },
  '/board': { href: '/board', label: 'Board', icon: 'grid' },
  '/handover': { href: '/handover', label: 'Handover', icon: 'print' },
  '/review': { href: '/review', label: 'Review queue', icon: 'review' },
  '/reports': { href: '/reports', label: 'Reports', icon: 'list' },
  '/admin': { href: '/admin', label: 'Admin', icon: 'users' },
  '/settings': { href: '/settings', label: 'Settings', icon: 'gear' },
};

/** What each role sees in the navigation; the server refuses the rest anyway. */
export function navItemsFor(role: Role): NavItem[] {
  switch (role) {
    case 'nurse':
      return [ITEMS['/infants'], ITEMS['/board'], ITEMS['/handover'], ITEMS['/settings']];
    case 'charge':
      return [ITEMS['/board'], { ...ITEMS['/infants'], label: 'Infants' }, ITEMS['/handover'], { ...ITEMS['/reports'], label: 'Audit' }, ITEMS['/settings']];
    case 'educator':
      return [ITEMS['/review'], ITEMS['/reports'], ITEMS['/board'], ITEMS['/settings']];
    case 'admin':
      return [ITEMS['/admin'], ITEMS['/settings']];
  }
}
