import { Router } from 'express';
import type { Knex } from 'knex';
import { parseBody } from '../../lib/validation';
import { authorizeProject } from '../projects/policy';
import { actorOf, deleteVersion, withVersion } from './route-helpers';
import { measurementDeleteQuerySchema, measurementExclusionSchema, measurementUpdateSchema } from './schemas';
import { deleteMeasurement, resolveMeasurementProjectId, setMeasurementExclusion, updateMeasurement } from './service';

/**
 * One measurement by id, mounted at /v1/measurements: edit, exclude from the fit, delete (editors;
 * the version comes from the body, `?version=` or If-Match). A campaign's list and batch writes
 * stay under /campaigns/:campaignId/measurements.
 */
export function measurementsRouter(deps: { knex: Knex }): Router {
  const { knex } = deps;
  const router = Router();
  const byMeasurement = authorizeProject(knex, 'editor', (req) => resolveMeasurementProjectId(knex, req.params.measurementId));

  router.patch('/:measurementId', byMeasurement, async (req, res) => {
    res.json(
      await updateMeasurement(knex, actorOf(req), String(req.params.measurementId), parseBody(measurementUpdateSchema, withVersion(req))),
    );
  });

  router.put('/:measurementId/exclusion', byMeasurement, async (req, res) => {
    res.json(
      await setMeasurementExclusion(
        knex,
        actorOf(req),
        String(req.params.measurementId),
        parseBody(measurementExclusionSchema, withVersion(req)),
      ),
    );
  });

  router.delete('/:measurementId', byMeasurement, async (req, res) => {
    const { reason } = parseBody(measurementDeleteQuerySchema, req.query);
    await deleteMeasurement(knex, actorOf(req), String(req.params.measurementId), deleteVersion(req, measurementDeleteQuerySchema), reason);
    res.status(204).end();
  });

  return router;
}
