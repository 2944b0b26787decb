/**
 * Refuses, before any handler runs, a request whose JSON body or query holds a string that cannot be stored
 * (U+0000 or an unpaired surrogate): 422 naming the field. Runs after the auth guard, so callers without a
 * valid token still get 401 first; runs before every service, so nothing is stored.
 */
import { Injectable, type CallHandler, type ExecutionContext, type NestInterceptor } from '@nestjs/common';
import { findTextIssues } from '@leadline/contracts';
import type { Observable } from 'rxjs';
import { ValidationProblem } from './problem';

@Injectable()
export class TextInputInterceptor implements NestInterceptor {
  intercept(ctx: ExecutionContext, next: CallHandler): Observable<unknown> {
    if (ctx.getType() === 'http') {
      const req = ctx.switchToHttp().getRequest<{ body?: unknown; query?: unknown }>();
      const issues = [...findTextIssues(req.body), ...findTextIssues(req.query, 'query')];
      if (issues.length > 0) throw new ValidationProblem(issues);
    }
    return next.handle();
  }
}
