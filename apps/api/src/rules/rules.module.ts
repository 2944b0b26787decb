import { Global, Module } from '@nestjs/common';
import { RuleSetsService } from './rule-sets.service';
import { RulesController } from './rules.controller';

@Global()
@Module({ controllers: [RulesController], providers: [RuleSetsService], exports: [RuleSetsService] })
export class RulesModule {}
