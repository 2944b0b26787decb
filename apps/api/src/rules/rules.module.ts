import { Global, Module } from '@nestjs/common';
import { ImpactService } from './impact.service';
import { RecheckService } from './recheck.service';
import { RuleSetsService } from './rule-sets.service';
import { RulesController } from './rules.controller';

@Global()
@Module({ controllers: [RulesController], providers: [RuleSetsService, ImpactService, RecheckService], exports: [RuleSetsService] })
export class RulesModule {}
