import { Page, Panel } from '../../components/ui/page';

export function ApiDocsRoute() {
  return (
    <Page title="API reference" lead="Eyrie's HTTP API speaks JSON; errors are RFC 9457 problem details.">
      <Panel>
        <p className="text-sm text-ink-700">
          The machine-readable description is served at <code className="font-mono">/api/v1/openapi.json</code>.
        </p>
      </Panel>
    </Page>
  );
}
