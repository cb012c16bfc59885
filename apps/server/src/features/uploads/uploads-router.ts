import type { Request, Response } from 'express';
import multer from 'multer';
import type { AppContext } from '../../lib/context.ts';
import { AppError } from '../../lib/app-error.ts';
import { requireUser, type RouteSpec } from '../../lib/route-table.ts';
import { acceptUpload, MAX_UPLOAD_BYTES } from './uploads-service.ts';
import { idParam } from '../../lib/route-params.ts';

const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: MAX_UPLOAD_BYTES, files: 1, fields: 20, fieldSize: 1024 },
});

function parseMultipart(req: Request, res: Response): Promise<void> {
  return new Promise((resolve, reject) => {
    upload.single('file')(req, res, (err: unknown) => {
      if (!err) return resolve();
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE')
          return reject(
            new AppError(
              'payload_too_large',
              `Files are limited to ${MAX_UPLOAD_BYTES / 1048576} MiB.`,
              413,
            ),
          );
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
      handler: async (req, res) => {
        const { id } = idParam.parse(req.params);
        if (!req.is('multipart/form-data'))
          throw new AppError(
            'invalid_upload',
            'Send the recording as multipart/form-data with a "file" field.',
            400,
          );
        await parseMultipart(req, res);
        const result = await acceptUpload(ctx, requireUser(req), id, req.file, req.body ?? {});
        res.status(result.status === 'queued' ? 201 : 200).json(result);
      },
    },
  ];
}
