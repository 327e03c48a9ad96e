import { lazy, Suspense } from 'react';
import type { FeatureRoute } from '../../app/feature.js';
import { Loading } from '../../components/ui.js';
import { paths } from '../../lib/paths.js';

const DictionaryPage = lazy(() => import('./DictionaryPage.js').then((m) => ({ default: m.DictionaryPage })));

/** Every signed-in role, researchers included (it describes variables, not cases). */
export const dictionaryRoutes: FeatureRoute[] = [
  { path: paths.dictionary, element: <Suspense fallback={<Loading what="the page" />}><DictionaryPage /></Suspense>, roles: 'signed-in', nav: { label: 'Data dictionary', group: 'Registry', order: 4 } },
];
