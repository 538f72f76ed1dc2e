import { Page } from '../../components/ui/page';
import { DistributionPanel } from '../../features/calculators/components/distribution-panel';
import { ErosionPanel } from '../../features/calculators/components/erosion-panel';
import { RatePanel } from '../../features/calculators/components/rate-panel';

/** Rate and hold: what a selectivity gain on cooling costs in time, and how much ee survives a hold. No sign-in. */
export function RateAndHoldRoute() {
  return (
    <Page
      title="Rate and hold"
      lead="Cooling that buys selectivity also slows the reaction. Estimate how long a reaction takes to finish across temperature, how fast the product's ee erodes while it waits, and how several competing pathways share the product. No sign-in; nothing is stored."
    >
      <div className="flex flex-col gap-6">
        <RatePanel />
        <ErosionPanel />
        <DistributionPanel />
      </div>
    </Page>
  );
}
