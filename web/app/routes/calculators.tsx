import { Page } from '../../components/ui/page';
import { RangeForecastPanel } from '../../features/calculators/components/range-forecast-panel';
import { FitPanel } from '../../features/calculators/components/fit-panel';
import { ConventionNote } from '../../components/ui/fields';

/** Calculators that need no sign-in: a forecast from one basis, and a fit of a pasted screen. */
export function CalculatorsRoute() {
  return (
    <Page
      title="Selectivity calculators"
      lead="Forecast the selectivity across temperature from one observation or an energy gap, or fit a small temperature screen and ask for the selectivity at a temperature you have not run. No sign-in; nothing is stored."
    >
      <ConventionNote className="mb-4 rounded border border-slate-200 bg-white px-3 py-2" />
      <div className="flex flex-col gap-6">
        <RangeForecastPanel />
        <FitPanel />
      </div>
    </Page>
  );
}
