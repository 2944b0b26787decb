import { Body, Controller, Get, Param, Post } from '@nestjs/common';
import { RULES } from '@leadline/rules';
import { Roles } from '../identities/auth.guard';
import { RuleSetsService } from './rule-sets.service';

@Controller('api/v1/rule-sets')
export class RulesController {
  constructor(private readonly ruleSets: RuleSetsService) {}

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
}
