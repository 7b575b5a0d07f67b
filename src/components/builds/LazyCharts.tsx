import { lazyChart } from '@/components/ui/lazy-chart';

/** The build page's charts, each loaded with Chart.js when it is about to be on screen. */
const charts = () => import('./Charts');

export const BudgetChart = lazyChart(() => charts().then((m) => m.BudgetChart), 'h-64');
export const BurpChart = lazyChart(() => charts().then((m) => m.BurpChart), 'h-64');
export const SweepChart = lazyChart(() => charts().then((m) => m.SweepChart), 'h-64');
export const SessionChart = lazyChart(() => charts().then((m) => m.SessionChart), 'h-64');
