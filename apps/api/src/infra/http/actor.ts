import { createParamDecorator, type ExecutionContext } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';

/** The authenticated caller, as the identities guard left it on the request (null when unauthenticated). */
export const CurrentActor = createParamDecorator((_: unknown, ctx: ExecutionContext): Actor | null => {
  const req = ctx.switchToHttp().getRequest<{ actor?: Actor }>();
  return req.actor ?? null;
});
