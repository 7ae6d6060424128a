/** The study report and CSV exports under /api/studies/:id (read access, like the study itself). */
import { Router } from 'express';
import { reportQuerySchema, resultsCsvQuerySchema } from '../../shared/api/report.ts';
import { actorOf, requireUser } from '../auth/index.ts';
import { studyReport, studyResultsCsv } from '../services/report.ts';
import { param, type RouteContext } from './context.ts';

export function reportRoutes({ db }: RouteContext): Router {
  const r = Router();
  r.get('/:id/report.pdf', requireUser, async (req, res) => {
    const { pdf, fileName } = await studyReport(db, actorOf(res), param(req.params.id), reportQuerySchema.parse(req.query));
    res.attachment(fileName);
    res.type('application/pdf');
    res.send(Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength));
  });
  r.get('/:id/results.csv', requireUser, async (req, res) => {
    const { csv, fileName } = await studyResultsCsv(db, actorOf(res), param(req.params.id), resultsCsvQuerySchema.parse(req.query));
    res.attachment(fileName);
    res.type('text/csv; charset=utf-8');
    res.send(csv);
  });
  return r;
}
