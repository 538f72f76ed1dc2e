// `npm run lint:openapi` (and the first steps of `npm test`): generate the API description exactly as
// GET /api/v1/openapi.json serves it and lint it with Redocly's recommended rules. Errors fail; warnings print.
import { createConfig, formatProblems, getTotals, lintFromString } from '@redocly/openapi-core';
import { buildOpenApiDocument } from '../api/lib/openapi';
import { openApiRegistrars } from '../api/features/docs/registrars';

const document = buildOpenApiDocument(openApiRegistrars, 'lint');
const config = await createConfig({ extends: ['recommended'] });
const problems = await lintFromString({ source: JSON.stringify(document, null, 2), absoluteRef: 'openapi.json', config });
const totals = getTotals(problems);
if (problems.length) formatProblems(problems, { format: 'codeframe', totals, version: 'eyrie' });
console.log(`openapi lint: ${totals.errors} error(s), ${totals.warnings} warning(s)`);
process.exit(totals.errors > 0 ? 1 : 0);
