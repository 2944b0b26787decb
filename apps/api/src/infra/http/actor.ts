import { createParamDecorator, type ExecutionContext } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';

/**
 * The authenticated caller, as the identities guard left it on the request (null when unauthenticated).
 * It carries the id of the bearer token used as a non-enumerable `tokenId`, so the record store can hash and
 * store it with the event while the actor itself, wherever it is stored or returned, stays { id, name }; and, as
 * non-enumerable `credential`, the stored hash of that token, which the record functions take as proof of who acts.
 */
export const CurrentActor = createParamDecorator((_: unknown, ctx: ExecutionContext): Actor | null => {
  const req = ctx.switchToHttp().getRequest<{ actor?: Actor; principal?: { tokenId?: string; roles?: string[]; credential?: string } }>();
  if (!req.actor) return null;
  return actingAs(req.actor, req.principal ?? {});
});

/** The actor { id, name } carrying the token id and credential it acts with (non-enumerable). */
export function actingAs(who: Actor, principal: { tokenId?: string | null; credential?: string | null }): Actor {
  const actor = { id: who.id, name: who.name };
  Object.defineProperty(actor, 'tokenId', { value: principal.tokenId ?? null, enumerable: false });
  Object.defineProperty(actor, 'credential', { value: principal.credential ?? null, enumerable: false });
  return actor;
}

/** The roles of the authenticated caller (empty when unauthenticated). */
export const CurrentRoles = createParamDecorator((_: unknown, ctx: ExecutionContext): string[] => {
  const req = ctx.switchToHttp().getRequest<{ principal?: { roles?: string[] } }>();
  return req.principal?.roles ?? [];
});
