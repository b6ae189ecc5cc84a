import { ArgumentsHost, BadRequestException, Catch, ExceptionFilter, PayloadTooLargeException } from '@nestjs/common';
import type { Response } from 'express';
import { ApiExceptionFilter } from '../common/filters/http-exception.filter';
import { MAX_CHARACTERIZATION_FILE_BYTES } from './characterization-csv';

/**
 * The upload's own words for what the multipart reader (multer) refuses before the file reaches the service:
 * its "File too large" and "Unexpected field" say neither the limit nor what to do. Anything else is answered as
 * the app-wide filter answers it.
 */
@Catch()
export class UploadRefusalFilter implements ExceptionFilter {
  private readonly fallback = new ApiExceptionFilter();

  catch(exception: unknown, host: ArgumentsHost): void {
    const res = host.switchToHttp().getResponse<Response>();
    if (exception instanceof PayloadTooLargeException) {
      const message = `The file is larger than the ${MAX_CHARACTERIZATION_FILE_BYTES} bytes (1 MiB) accepted and was not stored; split it into several data sets.`;
      res.status(413).json({ statusCode: 413, error: 'Payload Too Large', message, details: { code: 'file_too_large', problems: [{ line: 0, column: null, message }] } });
      return;
    }
    if (exception instanceof BadRequestException && /Unexpected field|Too many files/i.test(exception.message)) {
      const message = 'Send exactly one file, in the multipart form field "file", with the text fields "name" and (optionally) "product".';
      res.status(400).json({ statusCode: 400, error: 'Bad Request', message, details: { code: 'bad_form', problems: [{ line: 0, column: null, message }] } });
      return;
    }
    this.fallback.catch(exception, host);
  }
}
