import { useParams } from 'react-router-dom';
import { RunSummaryPanel } from '../../features/runs/components/run-summary-panel';
import { SharedReportView } from '../../features/share/components/shared-report-view';

/** /s/:token: a shared run or pack report, opened without an account. */
export function Component() {
  const { token = '' } = useParams();
  return (
    <SharedReportView
      token={token}
      renderSummary={(summary, report) => (
        <RunSummaryPanel
          summary={summary}
          temperatureUnit={report.lab.temperatureUnit}
          energyUnit={report.lab.energyUnit}
          currency={report.battery?.priceCurrency ?? ''}
        />
      )}
    />
  );
}
