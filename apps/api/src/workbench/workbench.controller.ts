import { Controller, Get, Query, Req } from '@nestjs/common';
import type { Principal } from '../identities/identities.service';
import { MyWorkService } from './my-work.service';

/** Who is signed in, and their own revisions: what the design workbench's "my work" page reads. */
@Controller('api/v1/me')
export class WorkbenchController {
  constructor(private readonly work: MyWorkService) {}

  /**
   * The caller: id, name, roles, how they authenticated, and for a page session the CSRF token its state-changing
   * requests send as X-CSRF-Token.
   */
  @Get()
  me(@Req() req: { principal: Principal }) {
    const p = req.principal;
    return { id: p.id, name: p.name, roles: p.roles, authMethod: p.authMethod, csrfToken: p.csrfToken ?? null };
  }

  /** The caller's revisions, newest first, with review state, decision and reviewers' comments (?state=, ?limit=). */
  @Get('revisions')
  revisions(@Req() req: { principal: Principal }, @Query() query: unknown) {
    return this.work.revisions(req.principal.id, query);
  }
}
