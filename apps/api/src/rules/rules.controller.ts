import { Body, Controller, Get, HttpCode, Param, Post } from '@nestjs/common';
import { RULES } from '@leadline/rules';
import { Roles } from '../identities/auth.guard';
import { ImpactService } from './impact.service';
import { RuleSetsService } from './rule-sets.service';

@Controller('api/v1/rule-sets')
export class RulesController {
  constructor(
    private readonly ruleSets: RuleSetsService,
    private readonly impacts: ImpactService,
  ) {}

  @Get()
  async list() {
    const sets = await this.ruleSets.list();
    return { current: this.ruleSets.current().version, items: sets, rules: RULES };
  }

  @Get(':version')
  get(@Param('version') version: string) {
    return this.ruleSets.get(version);
  }

  @Post()
  @Roles('admin')
  create(@Body() body: unknown) {
    return this.ruleSets.create(body);
  }

  /** Which stored revisions would change verdict under this rule-set version (nothing is altered). */
  @Post(':version/impact')
  @Roles('reviewer', 'admin')
  @HttpCode(200)
  impact(@Param('version') version: string, @Body() body: unknown) {
    return this.impacts.impact(version, body);
  }
}
