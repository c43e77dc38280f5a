import type { RouteLocationNormalized, RouteLocationRaw, RouteRecordInfo, RouteRecordRaw } from 'vue-router';
import { can, type Permission, type Role } from '@hodboard/shared';
import { prefetchCrewDays } from '@/api/crew-days';
import { useSessionStore } from '@/stores/session-store';
import { boardView, crewHomeView } from './early-views';
import { landOnBoard } from './guards';

export const routeNames = [
  'sign-in',
  'sign-up',
  'accept-invite',
  'forgot-password',
  'reset-password',
  'home',
  'crew-home',
  'board',
  'crew-calendar',
  'job',
  'time-off',
  'jobs',
  'crews',
  'clients',
  'sites',
  'people',
  'firm-settings',
  'quotes',
  'quote',
  'quote-client',
  'materials',
  'costing-settings',
  'costing-report',
  'suppliers',
  'access-bookings',
  'supplier-response',
  'weather-outlook',
  'not-allowed',
  'not-found',
] as const;
export type RouteName = (typeof routeNames)[number];

declare module 'vue-router' {
  interface RouteMeta {
    title: string;
    /** Reachable without a session (sign-in, links from e-mails). */
    isPublic?: boolean;
    /** Pointless with a session, so a signed-in visitor goes home instead. */
    isGuestOnly?: boolean;
    permission?: Permission;
    /** Shown without the app shell even to a signed-in visitor (a client's quote link). */
    isBare?: boolean;
  }
  interface TypesConfig {
    RouteNamedMap: {
      [Name in Exclude<RouteName, 'not-found' | 'job' | 'quote' | 'quote-client'>]: RouteRecordInfo<Name, string, Record<never, never>, Record<never, never>>;
    } & {
      job: RouteRecordInfo<'job', '/jobs/:id', { id: string }, { id: string }>;
      quote: RouteRecordInfo<'quote', '/quotes/:id', { id: string }, { id: string }>;
      'quote-client': RouteRecordInfo<'quote-client', '/q/:token', { token: string }, { token: string }>;
    } & {
      'not-found': RouteRecordInfo<
        'not-found',
        '/:pathMatch(.*)*',
        { pathMatch?: string | string[] },
        { pathMatch: string | string[] }
      >;
    };
  }
}

export const routes: RouteRecordRaw[] = [
  {
    path: '/sign-in',
    name: 'sign-in',
    component: () => import('@/views/SignInView.vue'),
    meta: { title: 'Sign in', isPublic: true, isGuestOnly: true },
  },
  {
    path: '/sign-up',
    name: 'sign-up',
    component: () => import('@/views/SignUpView.vue'),
    meta: { title: 'Start a firm', isPublic: true, isGuestOnly: true },
  },
  {
    path: '/accept-invite',
    name: 'accept-invite',
    component: () => import('@/views/AcceptInviteView.vue'),
    meta: { title: 'Join your firm', isPublic: true, isGuestOnly: true },
  },
  {
    path: '/forgot-password',
    name: 'forgot-password',
    component: () => import('@/views/ForgotPasswordView.vue'),
    meta: { title: 'Forgotten password', isPublic: true, isGuestOnly: true },
  },
  {
    path: '/reset-password',
    name: 'reset-password',
    component: () => import('@/views/ResetPasswordView.vue'),
    meta: { title: 'Choose a new password', isPublic: true, isGuestOnly: true },
  },
  {
    path: '/',
    name: 'home',
    component: () => import('@/views/HomeView.vue'),
    meta: { title: 'Overview' },
    beforeEnter: (_to, from) => landOnBoard(from, useSessionStore()) ?? landOnCrewHome(from, useSessionStore()) ?? true,
  },
  {
    path: '/crew',
    name: 'crew-home',
    component: crewHomeView,
    meta: { title: 'Your days', permission: 'jobs:read' },
    beforeEnter: () => {
      prefetchCrewDays();
      return true;
    },
  },
  {
    path: '/board',
    name: 'board',
    component: boardView,
    meta: { title: 'Board', permission: 'jobs:read' },
  },
  {
    path: '/calendar',
    name: 'crew-calendar',
    component: () => import('@/views/CrewCalendarView.vue'),
    meta: { title: 'Crew calendar', permission: 'jobs:read' },
  },
  {
    path: '/jobs/:id',
    name: 'job',
    component: () => import('@/views/JobView.vue'),
    meta: { title: 'Job', permission: 'jobs:read' },
  },
  {
    path: '/time-off',
    name: 'time-off',
    component: () => import('@/views/TimeOffView.vue'),
    meta: { title: 'Leave and closures', permission: 'crews:read' },
  },
  {
    path: '/jobs',
    name: 'jobs',
    component: () => import('@/views/JobsView.vue'),
    meta: { title: 'Jobs', permission: 'jobs:read' },
  },
  {
    path: '/crews',
    name: 'crews',
    component: () => import('@/views/CrewsView.vue'),
    meta: { title: 'Crews', permission: 'crews:read' },
  },
  {
    path: '/clients',
    name: 'clients',
    component: () => import('@/views/ClientsView.vue'),
    meta: { title: 'Clients', permission: 'clients:read' },
  },
  {
    path: '/sites',
    name: 'sites',
    component: () => import('@/views/SitesView.vue'),
    meta: { title: 'Sites', permission: 'clients:read' },
  },
  {
    path: '/people',
    name: 'people',
    component: () => import('@/views/PeopleView.vue'),
    meta: { title: 'People', permission: 'people:read' },
  },
  {
    path: '/firm',
    name: 'firm-settings',
    component: () => import('@/views/FirmSettingsView.vue'),
    meta: { title: 'Firm settings', permission: 'firm:manage' },
  },
  {
    path: '/quotes',
    name: 'quotes',
    component: () => import('@/views/QuotesView.vue'),
    meta: { title: 'Quotes', permission: 'quotes:manage' },
  },
  {
    path: '/quotes/:id',
    name: 'quote',
    component: () => import('@/views/QuoteEditView.vue'),
    meta: { title: 'Quote', permission: 'quotes:manage' },
  },
  {
    path: '/q/:token',
    name: 'quote-client',
    component: () => import('@/views/QuoteClientView.vue'),
    meta: { title: 'Your quote', isPublic: true, isBare: true },
  },
  {
    path: '/materials',
    name: 'materials',
    component: () => import('@/views/MaterialsView.vue'),
    meta: { title: 'Price list', permission: 'quotes:manage' },
  },
  {
    path: '/costing',
    name: 'costing-settings',
    component: () => import('@/views/CostingSettingsView.vue'),
    meta: { title: 'Costing settings', permission: 'quotes:manage' },
  },
  {
    path: '/margins',
    name: 'costing-report',
    component: () => import('@/views/CostingReportView.vue'),
    meta: { title: 'Quoted against achieved', permission: 'quotes:manage' },
  },
  {
    path: '/suppliers',
    name: 'suppliers',
    component: () => import('@/views/SuppliersView.vue'),
    meta: { title: 'Access suppliers', permission: 'access:read' },
  },
  {
    path: '/access',
    name: 'access-bookings',
    component: () => import('@/views/AccessBookingsView.vue'),
    meta: { title: 'Access bookings', permission: 'access:read' },
  },
  {
    path: '/supplier-response',
    name: 'supplier-response',
    component: () => import('@/views/SupplierResponseView.vue'),
    meta: { title: 'Access dates', isPublic: true, isBare: true },
  },
  {
    path: '/weather',
    name: 'weather-outlook',
    component: () => import('@/views/WeatherOutlookView.vue'),
    meta: { title: 'Weather outlook', permission: 'jobs:manage' },
  },
  {
    path: '/not-allowed',
    name: 'not-allowed',
    component: () => import('@/views/NotFoundView.vue'),
    props: { reason: 'denied' },
    meta: { title: 'Not available for your role' },
  },
  {
    path: '/:pathMatch(.*)*',
    name: 'not-found',
    component: () => import('@/views/NotFoundView.vue'),
    props: { reason: 'missing' },
    meta: { title: 'Page not found', isPublic: true },
  },
];

/** People on site arrive on their own days (today, tomorrow, the week ahead); the overview stays in the menu. */
function landOnCrewHome(from: RouteLocationNormalized, session: { role: Role | null }): RouteLocationRaw | undefined {
  const isArrival = from.matched.length === 0 || Boolean(from.meta.isGuestOnly);
  return isArrival && session.role && can(session.role, 'crew-home:use') ? { name: 'crew-home' } : undefined;
}
