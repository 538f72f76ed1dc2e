import { Link } from 'react-router-dom';
import { Page, Panel } from '../../components/ui/page';
import { SafetyCaution } from '../../components/ui/caution';
import { paths } from '../../config/paths';

export function HomeRoute() {
  return (
    <Page
      title="Pick the temperature that meets your selectivity specification"
      lead="Eyrie turns a temperature screen of an asymmetric or diastereoselective step into a forecast you can defend: the ratio you will get at an untested temperature, with honest uncertainty, and what that temperature costs in reaction time and stereochemical erosion."
    >
      <div className="grid gap-4 md:grid-cols-3">
        <Panel title="Forecast">
          <p className="text-sm text-ink-700">
            From an energy gap ΔΔG‡ (or ΔΔH‡ and ΔΔS‡), or one observed ee, er, dr or % A at one temperature, forecast the ratio across a
            temperature range and where selectivity would vanish.
          </p>
        </Panel>
        <Panel title="Fit a screen">
          <p className="text-sm text-ink-700">
            Regress ln r on 1/T (differential Eyring analysis) with the covariance kept, confidence and prediction bands, residual flags,
            censored high-ee points and a two-branch (isoinversion) check.
          </p>
        </Panel>
        <Panel title="Weigh the cost">
          <p className="text-sm text-ink-700">
            Rate and time to conversion from a measured run, the erosion of ee during a hold, and campaigns that compare catalysts and
            solvents within a project, exported as a spreadsheet for the team.
          </p>
        </Panel>
      </div>
      <div className="mt-6 grid gap-4 md:grid-cols-2">
        <Panel title="Sign convention">
          <p className="text-sm text-ink-700">
            A is the stereoisomer you name first (normally the desired one), r = [A]/[B]. Every differential is B’s transition state minus
            A’s: ΔΔX‡ = X‡(TS→B) − X‡(TS→A), so a positive ΔΔG‡ favours A. Much of the literature uses the opposite sign.
          </p>
        </Panel>
        <SafetyCaution />
      </div>
      <p className="mt-6 text-sm text-ink-600">
        Try it without signing in: the{' '}
        <Link className="text-fjord-700 underline" to={paths.calculators.getHref()}>
          selectivity calculators
        </Link>{' '}
        forecast from one observation and fit a pasted screen.
      </p>
      <p className="mt-2 text-sm text-ink-600">
        Machine access: the computation API is described in the{' '}
        <Link className="text-fjord-700 underline" to={paths.apiDocs.getHref()}>
          API reference
        </Link>
        .
      </p>
    </Page>
  );
}
