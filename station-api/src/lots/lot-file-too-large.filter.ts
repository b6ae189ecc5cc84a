import { ArgumentsHost, Catch, ExceptionFilter, PayloadTooLargeException } from '@nestjs/common';
import type { Response } from 'express';
import { MAX_LOT_FILE_BYTES } from './lot-csv';

/** Multer stops an upload over the size bound with a bare "File too large"; say what to do instead. */
@Catch(PayloadTooLargeException)
export class LotFileTooLargeFilter implements ExceptionFilter {
  catch(_exception: PayloadTooLargeException, host: ArgumentsHost): void {
    host
      .switchToHttp()
      .getResponse<Response>()
      .status(413)
      .json({
        statusCode: 413,
        error: 'Payload Too Large',
        message: `The lot file is larger than ${MAX_LOT_FILE_BYTES / 1_000_000} MB. Split it into smaller files and import them one after another.`,
        details: { code: 'lot_file_refused', problems: [{ row: 0, column: '(file)', message: `the file is larger than ${MAX_LOT_FILE_BYTES / 1_000_000} MB; split it` }] },
      });
  }
}
