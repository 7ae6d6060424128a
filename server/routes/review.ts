/**
 * Review and reuse routes under /api/studies/:id (revisions, diff, review, comments, attachments,
 * export) and /api/studies/import. Thin: parse, call the service, answer.
 */
import { pipeline } from 'node:stream/promises';
import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { ATTACHMENT_MAX_BYTES } from '../../shared/api/attachments.ts';
import { createCommentRequestSchema, updateCommentRequestSchema } from '../../shared/api/comments.ts';
import { createRevisionRequestSchema, diffQuerySchema, restoreRevisionRequestSchema } from '../../shared/api/revisions.ts';
import { reviewActionRequestSchema } from '../../shared/api/review.ts';
import { importQuerySchema } from '../../shared/api/transfer.ts';
import { actorOf, requireRole, requireUser } from '../auth/index.ts';
import { AppError } from '../errors.ts';
import { addAttachment, deleteAttachment, listAttachments, readAttachment } from '../services/attachments.ts';
import { createComment, deleteComment, listComments, updateComment } from '../services/comments.ts';
import { getReviewState, reviewAction } from '../services/review.ts';
import { diffStudy, getRevision, listRevisions, revisionNumber } from '../services/revisions.ts';
import { applyEdit, getStudy } from '../services/studies.ts';
import { exportStudy, importStudy } from '../services/transfer.ts';
import { param, type RouteContext } from './context.ts';

/** multer in memory with the 10 MB limit; its errors become contract errors (413, 400). */
function singleFile(): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: ATTACHMENT_MAX_BYTES, files: 1, fields: 10 } }).single('file');
  return (req, res, next) => {
    upload(req, res, (err: unknown) => {
      if (!err) return next();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') {
          return next(new AppError(413, 'payload-too-large', `The file is larger than ${ATTACHMENT_MAX_BYTES / 1024 / 1024} MB.`));
        }
        return next(new AppError(400, 'validation', `The upload could not be read: ${err.message}.`, { fields: { file: err.message } }));
      }
      // Anything else from the multipart parser is a body it could not read (truncated, malformed
      // part headers, a bad boundary): a client error, whatever the parser calls it.
      next(new AppError(400, 'validation', 'The upload could not be read: the form data is malformed.', { fields: { file: 'Malformed form data' } }));
    });
  };
}

export function reviewRoutes({ db, mailer, config, objects }: RouteContext): Router {
  const r = Router();
  const write = requireRole('engineer');
  const comment = requireRole('reviewer');
  const id = (v: string | string[] | undefined) => param(v);

  r.post('/import', write, async (req, res) => {
    const { name } = importQuerySchema.parse(req.query);
    // The body arrives as its bytes (or, in another character set, as text: app.ts): the file is
    // decoded, parsed and checked in the work pool.
    const body: unknown = req.body;
    res.status(201).json(await importStudy(db, actorOf(res), Buffer.isBuffer(body) || typeof body === 'string' ? body : undefined, name));
  });

  // Revisions
  r.get('/:id/revisions', requireUser, async (req, res) => {
    const study = await getStudy(db, actorOf(res), id(req.params.id));
    res.json({ items: await listRevisions(db, study.id) });
  });
  r.post('/:id/revisions', write, async (req, res) => {
    const input = createRevisionRequestSchema.parse(req.body);
    const saved = await applyEdit(db, actorOf(res), id(req.params.id), { ...input, requireChange: true });
    res.status(201).json(saved);
  });
  r.get('/:id/revisions/:n', requireUser, async (req, res) => {
    const study = await getStudy(db, actorOf(res), id(req.params.id));
    res.json(await getRevision(db, study.id, revisionNumber(param(req.params.n))));
  });
  r.post('/:id/revisions/:n/restore', write, async (req, res) => {
    const input = restoreRevisionRequestSchema.parse(req.body ?? {});
    const actor = actorOf(res);
    const study = await getStudy(db, actor, id(req.params.id));
    const old = await getRevision(db, study.id, revisionNumber(param(req.params.n)));
    const saved = await applyEdit(db, actor, study.id, {
      version: input.version,
      content: old.content,
      message: input.message ?? `Restored revision ${old.number}`,
      restoredFrom: old.number,
      requireChange: true,
    });
    res.status(201).json(saved);
  });
  r.get('/:id/diff', requireUser, async (req, res) => {
    const actor = actorOf(res);
    const study = await getStudy(db, actor, id(req.params.id));
    res.json(await diffStudy(db, actor, study.id, diffQuerySchema.parse(req.query)));
  });

  // Review
  r.get('/:id/review', requireUser, async (req, res) => {
    res.json(await getReviewState(db, actorOf(res), id(req.params.id)));
  });
  r.post('/:id/review', comment, async (req, res) => {
    res.json(await reviewAction(db, mailer, config.appUrl, actorOf(res), id(req.params.id), reviewActionRequestSchema.parse(req.body)));
  });

  // Comments
  r.get('/:id/comments', requireUser, async (req, res) => {
    res.json(await listComments(db, actorOf(res), id(req.params.id)));
  });
  r.post('/:id/comments', comment, async (req, res) => {
    res.status(201).json(await createComment(db, mailer, config.appUrl, actorOf(res), id(req.params.id), createCommentRequestSchema.parse(req.body)));
  });
  r.patch('/:id/comments/:commentId', comment, async (req, res) => {
    const input = updateCommentRequestSchema.parse(req.body);
    res.json(await updateComment(db, mailer, config.appUrl, actorOf(res), id(req.params.id), param(req.params.commentId), input));
  });
  r.delete('/:id/comments/:commentId', comment, async (req, res) => {
    await deleteComment(db, actorOf(res), id(req.params.id), param(req.params.commentId));
    res.status(204).end();
  });

  // Attachments
  r.get('/:id/attachments', requireUser, async (req, res) => {
    res.json(await listAttachments(db, actorOf(res), id(req.params.id)));
  });
  r.post('/:id/attachments', comment, async (req, res, next) => {
    // Check the study before reading a 10 MB body for it.
    await getStudy(db, actorOf(res), id(req.params.id));
    next();
  }, singleFile(), async (req, res) => {
    res.status(201).json(await addAttachment(db, objects, actorOf(res), id(req.params.id), req.file));
  });
  r.get('/:id/attachments/:attachmentId', requireUser, async (req, res) => {
    const { row, body } = await readAttachment(db, objects, actorOf(res), id(req.params.id), param(req.params.attachmentId));
    res.setHeader('X-Content-Type-Options', 'nosniff');
    res.attachment(row.fileName);
    res.type(row.contentType);
    res.setHeader('Content-Length', String(row.size));
    // Streamed from the bucket; a store that fails mid-way ends the response (the client sees a short download).
    await pipeline(body, res).catch(() => res.destroy());
  });
  r.delete('/:id/attachments/:attachmentId', comment, async (req, res) => {
    await deleteAttachment(db, objects, actorOf(res), id(req.params.id), param(req.params.attachmentId));
    res.status(204).end();
  });

  // Export
  r.get('/:id/export', requireUser, async (req, res) => {
    const { file, fileName } = await exportStudy(db, actorOf(res), id(req.params.id));
    res.attachment(fileName);
    res.type('application/json');
    res.send(JSON.stringify(file, null, 2));
  });

  return r;
}
