import { Router, type RequestHandler } from 'express';
import multer from 'multer';
import { z } from 'zod';
import {
  PHOTO_MAX_BYTES,
  idParamsSchema,
  photoListQuerySchema,
  photoSettingsSchema,
  photoUploadFieldsSchema,
  photoVariants,
} from '@hodboard/shared';
import { errors } from '../errors.js';
import { endpoint } from '../middleware/validate.js';
import { tooLarge, type PhotoService } from '../services/photo-service.js';

/**
 * Parses one multipart photo into memory, never to disk: a refused file must leave nothing behind, and
 * the limit stops reading a too-large body instead of buffering it all.
 */
function singlePhoto(): RequestHandler {
  const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: PHOTO_MAX_BYTES, files: 1, fields: 10, fieldSize: 4096 } }).single('photo');
  return (req, res, next) => {
    if (!req.is('multipart/form-data')) {
      return next(errors.validation([{ path: 'photo', message: 'Send the photo as multipart/form-data in a field named "photo"' }], 'No photo was sent.'));
    }
    upload(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
        return next(errors.validation([{ path: error.field ?? 'photo', message: `Upload not accepted: ${error.message}` }], 'The upload could not be read.'));
      }
      next(error);
    });
  };
}

export function photosRouter(photos: PhotoService): Router {
  const router = Router();
  router.get('/settings', ...endpoint({}, async ({ actor }, _req, res) => {
    res.json(await photos.settings(actor));
  }));
  router.put('/settings', ...endpoint({ body: photoSettingsSchema }, async ({ actor, body }, _req, res) => {
    res.json(await photos.saveSettings(actor, body));
  }));
  router.get('/', ...endpoint({ query: photoListQuerySchema }, async ({ actor, query }, _req, res) => {
    res.json(await photos.list(actor, query.jobId));
  }));
  router.post('/', singlePhoto(), ...endpoint({ body: photoUploadFieldsSchema }, async ({ actor, body }, req, res) => {
    const { photo, isNew } = await photos.upload(actor, body, req.file);
    res.status(isNew ? 201 : 200).json(photo);
  }));
  router.get('/:id', ...endpoint({ params: idParamsSchema }, async ({ actor, params }, _req, res) => {
    res.json(await photos.get(actor, params.id));
  }));
  return router;
}

const signedParams = z.object({ id: z.uuid(), variant: z.enum(photoVariants) });
const signedQuery = z.object({ expires: z.coerce.number().int(), signature: z.string().min(20).max(100) });

/** Reached by <img> tags and the offline cache, which cannot send a session: the link's signature decides. */
export function publicPhotosRouter(photos: PhotoService): Router {
  const router = Router();
  router.get('/:id/:variant', ...endpoint({ params: signedParams, query: signedQuery }, async ({ params, query }, _req, res) => {
    const object = await photos.signedObject(params.id, params.variant, query.expires, query.signature);
    res.set({ 'Content-Type': object.contentType, 'Cache-Control': 'private, max-age=86400, immutable', 'X-Content-Type-Options': 'nosniff' });
    res.send(object.body);
  }));
  return router;
}
