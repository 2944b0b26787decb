import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import type { Actor } from '@leadline/contracts';
import { RULES } from '@leadline/rules';
import { CurrentActor } from '../infra/http/actor';
import { Roles } from '../identities/auth.guard';
import { ImpactService } from './impact.service';
import { RecheckService } from './recheck.service';
import { RuleSetsService } from './rule-sets.service';

@Controller('api/v1/rule-sets')
export class RulesController {
  constructor(
    private readonly ruleSets: RuleSetsService,
    private readonly impacts: ImpactService,
    private readonly rechecks: RecheckService,
  ) {}

  /**
   * Re-check of stored work with the current engine and the adopted rule set: latest and approved revisions whose
   * verdict changes or whose governing margin drops below its limit, old and new figures side by side (nothing is written).
   */
  @Post('recheck')
  @Roles('reviewer', 'admin')
  @HttpCode(200)
  recheck(@Body() body: unknown) {
    return this.rechecks.recheck(body);
  }

  @Get()
  async list() {
    const sets = await this.ruleSets.list();
    return { current: this.ruleSets.current().version, items: sets, invalid: this.ruleSets.invalid(), rules: RULES, adoptions: await this.ruleSets.adoptions() };
  }

  /** Judge new submissions by this version from now on (stored revisions keep the version they were judged by). */
  @Post(':version/adopt')
  @Roles('admin')
  @HttpCode(200)
  adopt(@Param('version') version: string, @Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.ruleSets.adopt(version, body, actor);
  }

  @Get(':version')
  get(@Param('version') version: string) {
    return this.ruleSets.get(version);
  }

  @Post()
  @Roles('admin')
  create(@Body() body: unknown, @CurrentActor() actor: Actor | null) {
    return this.ruleSets.create(body, actor);
  }

  /** Which stored revisions would change verdict under this rule-set version (nothing is altered). */
  @Post(':version/impact')
  @Roles('reviewer', 'admin')
  @HttpCode(200)
  impact(@Param('version') version: string, @Body() body: unknown) {
    return this.impacts.impact(version, body);
  }
}
