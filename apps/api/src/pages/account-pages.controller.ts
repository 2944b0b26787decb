import { Controller, Get, Res } from '@nestjs/common';
import type { FastifyReply } from 'fastify';
import { Public } from '../identities/auth.guard';
import { sendPage } from './pages.controller';
import { PageRenderer } from './page-renderer';

/**
 * The sign-in page (email and password, activation with a one-time code, the identity provider when configured) and
 * the admins' users page. Public shells: the users page's module asks the admin-only JSON API for everything.
 */
@Public()
@Controller()
export class AccountPagesController {
  constructor(private readonly pages: PageRenderer) {}

  @Get('sign-in')
  signIn(@Res({ passthrough: true }) reply: FastifyReply) {
    return sendPage(reply, this.pages.render('sign-in'));
  }

  /** The signed-in user's own account: their passkeys. */
  @Get('account')
  account(@Res({ passthrough: true }) reply: FastifyReply) {
    return sendPage(reply, this.pages.render('account'));
  }

  /** Users, roles, deactivation, password resets and tokens (admin). */
  @Get('admin/users')
  users(@Res({ passthrough: true }) reply: FastifyReply) {
    return sendPage(reply, this.pages.render('admin-users'));
  }
}
