import type { Request, Response } from 'express';
import multer from 'multer';
import { uploadFieldsSchema, uploadResultSchema } from '@turnstone/contracts/uploads';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { acceptUpload } from './uploads-service.ts';
import { idParam } from '../../lib/route-params.ts';
import { boundedMemoryStorage, MAX_UPLOAD_BYTES, tooLarge } from './upload-bounds.ts';
import { takeUploadSlot } from './upload-pool.ts';

/** Room for the multipart framing and the capture settings beside the file. */
const MULTIPART_OVERHEAD = 64 * 1024;

const upload = multer({
  storage: boundedMemoryStorage(),
  limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 20, fieldSize: 1024 },
});

function parseMultipart(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    upload.single('file')(req, res, (err: unknown) => {
      if (!err) return resolve();
      if (err instanceof AppError) return reject(err);
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE')
          return reject(tooLarge(`Files are limited to ${MAX_UPLOAD_BYTES / 1048576} MiB.`));
        return reject(new AppError('invalid_upload', `Upload refused: ${err.message}.`, 400));
      }
      reject(new AppError('invalid_upload', `Upload refused: ${(err as Error).message}`, 400));
    });
  });
}

export function uploadRoutes(ctx: AppContext): RouteSpec[] {
  return [
    {
      method: 'post',
      path: '/points/:id/uploads',
      access: ['engineer', 'admin'],
      summary: 'upload a recording',
      schemas: {
        params: idParam,
        form: { fields: uploadFieldsSchema, file: 'file' },
        response: uploadResultSchema,
        status: [201, 200],
      },
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        if (!req.is('multipart/form-data'))
          throw new AppError(
            'invalid_upload',
            'Send the recording as multipart/form-data with a "file" field.',
            400,
          );
        const length = Number(req.headers['content-length']);
        if (length > MAX_UPLOAD_BYTES + MULTIPART_OVERHEAD)
          throw tooLarge(
            `The upload is ${(length / 1048576).toFixed(1)} MiB; files are limited to ${MAX_UPLOAD_BYTES / 1048576} MiB.`,
          );
        const user = requireUser(req);
        const release = takeUploadSlot(user.id);
        try {
          await parseMultipart(req, res);
          const result = await acceptUpload(ctx, user, id, req.file, req.body ?? {});
          res.status(result.status === 'queued' ? 201 : 200).json(result);
        } finally {
          release();
          req.file = undefined;
        }
      },
    },
  ];
}
