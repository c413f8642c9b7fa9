/** One overview pass on the page's agreement worker (its second entry; kept between runs: see dashboard-worker.ts). */
import * as Comlink from 'comlink';
import type { OverviewRequest, OverviewResult } from '../../../workers/agreement-overview';
import type { LayerScanProgress } from '../../../workers/agreement-read';
import type { WorkerJob } from '../../../workers/worker-job';
import { dashboardJobStart } from '../agreement/dashboard-worker';

export function overviewStart(request: OverviewRequest, onProgress: (p: LayerScanProgress) => void): WorkerJob<OverviewResult> {
  return dashboardJobStart<LayerScanProgress, OverviewResult>('overview', (a, progress) => a.overview(request, Comlink.proxy(progress)), onProgress, 'The overview');
}
