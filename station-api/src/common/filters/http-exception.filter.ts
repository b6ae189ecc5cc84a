import {
  ArgumentsHost,
  BadRequestException,
  Catch,
  ExceptionFilter,
  HttpException,
  HttpStatus,
  Logger,
} from '@nestjs/common';
import { NotFoundError, UniqueConstraintViolationException, ForeignKeyConstraintViolationException } from '@mikro-orm/core';
import type { Response } from 'express';
import { STATUS_CODES } from 'node:http';

/** The one error shape every route answers with. */
export interface ApiError {
  statusCode: number;
  error: string;
  message: string;
  details?: unknown;
}

@Catch()
export class ApiExceptionFilter implements ExceptionFilter {
  private readonly logger = new Logger('ApiError');

  catch(exception: unknown, host: ArgumentsHost): void {
    if (host.getType() !== 'http') throw exception;
    const res = host.switchToHttp().getResponse<Response>();
    const body = this.toBody(exception);
    if (body.statusCode >= 500) this.logger.error(exception instanceof Error ? exception.stack : String(exception));
    res.status(body.statusCode).json(body);
  }

  toBody(exception: unknown): ApiError {
    if (exception instanceof HttpException) {
      const status = exception.getStatus();
      const resp = exception.getResponse();
      let message = exception.message;
      let details: unknown;
      if (typeof resp === 'object' && resp !== null) {
        const r = resp as Record<string, unknown>;
        if (Array.isArray(r.message)) {
          details = r.message;
          message = (r.message as string[]).join('; ');
        } else if (typeof r.message === 'string') {
          message = r.message;
        }
        if (r.details !== undefined) details = r.details;
      }
      // body-parser errors (malformed JSON) arrive as 400 HttpErrors with a technical text
      if (exception instanceof BadRequestException && /JSON/.test(message) && !details) {
        message = `The request body is not valid JSON: ${message}`;
      }
      return { statusCode: status, error: STATUS_CODES[status] ?? 'Error', message, ...(details !== undefined ? { details } : {}) };
    }
    if (exception instanceof NotFoundError) {
      return { statusCode: 404, error: 'Not Found', message: exception.message };
    }
    if (exception instanceof UniqueConstraintViolationException) {
      return { statusCode: 409, error: 'Conflict', message: 'A record with the same unique value already exists.' };
    }
    if (exception instanceof ForeignKeyConstraintViolationException) {
      return { statusCode: 409, error: 'Conflict', message: 'The record refers to, or is referred to by, another record.' };
    }
    // body-parser raises plain errors with a status (e.g. 413, 400 for bad JSON)
    const e = exception as { status?: number; statusCode?: number; message?: string; type?: string };
    const status = e?.status ?? e?.statusCode;
    if (typeof status === 'number' && status >= 400 && status < 500) {
      const message = e.type === 'entity.parse.failed' ? 'The request body is not valid JSON.' : (e.message ?? 'Bad request');
      return { statusCode: status, error: STATUS_CODES[status] ?? 'Error', message };
    }
    return {
      statusCode: HttpStatus.INTERNAL_SERVER_ERROR,
      error: 'Internal Server Error',
      message: 'Something went wrong on the station server. The error has been logged; nothing you sent was lost.',
    };
  }
}
