import { ExecutionContext, HttpException, HttpStatus, Injectable } from '@nestjs/common';
import { ThrottlerGuard, ThrottlerLimitDetail } from '@nestjs/throttler';

/**
 * Limits sign-in attempts per client address (LOGIN_ATTEMPTS_PER_MINUTE). Applied to the login route
 * only, never app-wide, so station traffic is not rate limited.
 */
@Injectable()
export class LoginThrottlerGuard extends ThrottlerGuard {
  protected override async throwThrottlingException(_context: ExecutionContext, detail: ThrottlerLimitDetail): Promise<void> {
    const retryAfterS = Math.max(1, Math.ceil(detail.timeToBlockExpire));
    throw new HttpException(
      {
        message: `Too many sign-in attempts from this computer (${detail.limit} per minute allowed). Try again in ${retryAfterS} s.`,
        details: { code: 'too_many_attempts', retryAfterS },
      },
      HttpStatus.TOO_MANY_REQUESTS,
    );
  }
}
